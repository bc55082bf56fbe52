export { FitDataError, FitSettingsError } from './errors.js';
export type {
  GeometryOption,
  JointModelInput,
  LightCurveInput,
  LimbDarkeningOption,
  NumberColumn,
  PlanetInput,
  RvDataInput,
  RvModelInput,
  SharedModelInput,
  StarInput,
  TransitModelInput,
  TrendOption,
} from './inputs.js';
export type { PriorInput } from './priorInput.js';
export { createRvModel, createTransitModel, createJointModel } from './createModels.js';
export type { ParameterSummary, PlanetSystemModel } from './planetModel.js';
export { centredSupport } from './supports/centred.js';
export { eccentricityDiskPrior } from './eccentricityPrior.js';
export {
  simulateLightCurve,
  simulateRadialVelocities,
  type LightCurveSimulation,
  type RvSimulation,
  type SimulatedData,
  type SimulatedPlanet,
} from './simulate.js';
export { fitPanels, type DataPanel, type FitPanelOptions, type PanelCurve, type PanelDraws, type PanelGroup } from './fitPlots.js';

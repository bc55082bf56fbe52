export * from './errors.js';
export {
  completeEllipticE,
  completeEllipticK,
  completeEllipticPi,
  generalCompleteEllipticIntegral,
} from './ellipticIntegrals.js';
export {
  FLUX_DK,
  FLUX_DU1,
  FLUX_DU2,
  FLUX_DZ,
  FLUX_PARTIALS_SIZE,
  FLUX_VALUE,
  quadraticFluxPartialsUnchecked,
  quadraticFluxUnchecked,
  quadraticTransitFlux,
  quadraticTransitFluxWithPartials,
} from './quadraticFlux.js';
export {
  isPhysicalLimbDarkening,
  kippingFromLimbDarkening,
  kippingJacobianInto,
  limbDarkeningFromKipping,
  type KippingLimbDarkening,
  type QuadraticLimbDarkening,
} from './limbDarkening.js';
export * from './orbitConversions.js';
export * from './durations.js';
export * from './transitGeometry.js';
export {
  TP_ANGLE,
  TP_ECCENTRICITY,
  TP_OMEGA,
  TP_PERIOD,
  TP_RADIUS_RATIO,
  TP_SCALED_AXIS,
  TP_TC,
  TRANSIT_PLANET_STRIDE,
  transitParameterCount,
  transitParameterNames,
  type TransitAngleForm,
  type TransitScaleForm,
} from './transitParameters.js';
export * from './lightCurve.js';
export * from './lightCurveLikelihood.js';
export * from './lightCurveOp.js';

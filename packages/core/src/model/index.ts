export { compileModel, type CompiledModel, type CompileOptions, type LogDensityParts } from './compileModel.js';
export {
  tensorLikelihood,
  float64Likelihood,
  type DataRecord,
  type DataValue,
  type DerivedQuantity,
  type ExactData,
  type ExactValues,
  type Float64Likelihood,
  type Float64LogLikelihood,
  type Likelihood,
  type ModelSpec,
  type ParameterDeclaration,
  type TensorContext,
  type TensorLikelihood,
  type TensorLogLikelihood,
} from './spec.js';
export type { ParameterLayout, ParameterSlot } from './layout.js';
export { supports, type AngleOptions, type Support, type SupportKind, type Transform } from './supports/index.js';
export {
  priors,
  isVectorPrior,
  type CustomPriorSpec,
  type Prior,
  type RandomSource,
  type ScalarPrior,
  type VectorPrior,
} from './priors/index.js';
export {
  ModelDataError,
  ModelDeclarationError,
  ModeSearchOptionsError,
  ParameterValueError,
  PriorArgumentError,
  SupportArgumentError,
} from './errors.js';
export {
  selectBackend,
  loadTensorFlow,
  requireTensorFlow,
  BackendSelectionError,
  DEFAULT_BACKEND,
  type BackendChoice,
  type BackendInfo,
  type BackendOptions,
  type TensorFlow,
} from '../tensorflow/index.js';
export { findMode, type ModeSearchOptions, type ModeSearchReason, type ModeSearchResult } from './mode/findMode.js';
export { handWrittenTarget, checkTargetGradient, type GradientCheck, type HandWrittenTargetSpec } from './handWrittenTarget.js';
export { drawsByName, type RecordedOutputs } from './drawsByName.js';

export { SamplerOptionsError, InitialisationError, ChainStateError } from './errors.js';
export {
  identityMetric,
  diagonalMetric,
  denseMetric,
  applyInverseMass,
  drawMomentum,
  kineticEnergy,
  type Metric,
  type MetricKind,
} from './metric.js';
export { choleskyLower } from './cholesky.js';
export { createPhasePoint, copyPhasePoint, hamiltonian, type PhasePoint } from './phasePoint.js';
export { leapfrogStep } from './leapfrog.js';
export { trajectoryPersists, mergeSegments } from './uTurn.js';
export { nutsTransition, createNutsWorkspace, divergenceThreshold, type NutsWorkspace } from './nuts.js';
export { hmcTransition, createHmcWorkspace, type HmcWorkspace, type StaticPath } from './staticHmc.js';
export { heuristicStepSize } from './stepSizeHeuristic.js';
export {
  startDualAveraging,
  recentreDualAveraging,
  updateDualAveraging,
  averagedStepSize,
  defaultDualAveragingConstants,
  type DualAveragingState,
  type DualAveragingConstants,
} from './dualAveraging.js';
export {
  createWelford,
  addToWelford,
  resetWelford,
  regularisedCovariance,
  correlationShrinkage,
  denseMinimumDrawsPerDim,
  type WelfordState,
} from './welford.js';
export {
  warmupSchedule,
  slowWindowIndex,
  minimumWarmupForMetric,
  type WarmupSchedule,
} from './warmupSchedule.js';
export {
  resolveChainSettings,
  defaultHmcSteps,
  type ChainSettings,
  type ChainSettingsInput,
  type SamplerMethod,
} from './chainSettings.js';
export type { ChainPoint } from './chainPoint.js';
export { createChainWorkspace, type ChainWorkspace } from './chainWorkspace.js';
export { findInitialPosition, maxInitialisationAttempts } from './initialPosition.js';
export { createChainState, chainPhase, type ChainState, type ChainPhase } from './chainState.js';
export { advanceChain, type ChainStep } from './advanceChain.js';
export {
  serialiseChainState,
  restoreChainState,
  chainStateFormat,
  chainStateVersion,
  type SerialisedChainState,
} from './chainCheckpoint.js';
export {
  createStatsColumns,
  recordStats,
  type TransitionStats,
  type StatsColumns,
} from './transitionStats.js';
export {
  resolveRunOptions,
  type RunOptions,
  type ResolvedRunOptions,
  type ChainProgress,
} from './runOptions.js';
export {
  runChains,
  chainAdaptation,
  type RunResult,
  type RunSection,
  type ChainAdaptation,
} from './runChains.js';

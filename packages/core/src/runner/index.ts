export {
  RunOptionsError,
  RunFolderError,
  CheckpointError,
  TargetRecipeError,
  TargetMismatchError,
  WorkerFailureError,
} from './errors.js';
export {
  loadRecipeTarget,
  resolveTargetRecipe,
  isTargetRecipe,
  checkTarget,
  targetRecipeSchema,
  type TargetRecipe,
  type ResolvedTargetRecipe,
  type JsonValue,
} from './targetRecipe.js';
export { trustedRecipePackages, isTrustedRecipeModule, recipeForResume } from './recipeTrust.js';
export { executeRun } from './executeRun.js';
export { resumeRun, type ResumeRunOptions } from './resumeRun.js';
export { readRun, type RunFolderContents, type ReadRunOptions } from './readRun.js';
export type { LongRunResult } from './runSession.js';
export { resolveExecuteOptions, defaultThreads, type ExecuteRunOptions } from './runnerOptions.js';
export {
  resolveConvergenceCriteria,
  assessConvergence,
  checkPoints,
  type ConvergenceCriteria,
  type ResolvedConvergenceCriteria,
  type ConvergenceAssessment,
  type QuantityConvergence,
} from './convergence.js';
export type { RunProgress, ChainProgressLine } from './progressTracker.js';
export {
  createProgressDisplay,
  progressWanted,
  progressLines,
  formatDuration,
  type ProgressDisplay,
  type ProgressStream,
} from './progressDisplay.js';
export { readManifest, manifestFile, runFolderFormat, runFolderVersion, type RunManifest } from './runManifest.js';
export { outcomeFile, type RunOutcome, type RunStop, type StopReason } from './runOutcome.js';
export { checkpointFormat, checkpointVersion } from './checkpointStore.js';
export { traceStatColumns, coordinatePrefix } from './traceFormat.js';
export { checkRelativePath, resolveInside } from './folderPaths.js';

/** An option of `executeRun`, `resumeRun` or `readRun` is missing, of the wrong type or out of range. */
export class RunOptionsError extends Error {
  override readonly name = 'RunOptionsError';
}

/**
 * A run folder is missing, foreign (not made by apsis), truncated, inconsistent, or
 * names a path that would leave the folder.
 */
export class RunFolderError extends Error {
  override readonly name = 'RunFolderError';
}

/** A checkpoint file cannot be used (unreadable, damaged, or from another run). */
export class CheckpointError extends Error {
  override readonly name = 'CheckpointError';
}

/** A target recipe is malformed, or its module or export cannot build a target. */
export class TargetRecipeError extends Error {
  override readonly name = 'TargetRecipeError';
}

/** The target given to continue a run is not the target the run was made with. */
export class TargetMismatchError extends Error {
  override readonly name = 'TargetMismatchError';
}

/** A worker thread failed (threw, exited early or could not start). */
export class WorkerFailureError extends Error {
  override readonly name = 'WorkerFailureError';
}

import type { ConvergenceCriteria } from './convergence.js';

/**
 * The long-run options `runChains` accepts besides the sampler's own; with any of
 * them, or with a target recipe, `runChains` hands the run to `executeRun`.
 */
export interface LongRunOptions {
  /** Worker threads (0: the calling thread); needs a target recipe above 0. Default for a recipe: min(chains, cores). */
  threads?: number;
  /** Run folder for traces, checkpoints and the outcome (new or empty). */
  folder?: string;
  /** Iterations between checkpoints in the run folder (default 500; 0: none). */
  checkpointEvery?: number;
  /**
   * Fewest seconds between two checkpoints (default 10): a boundary reached sooner is
   * skipped, which bounds the cost of checkpoints for fast targets. The last iteration
   * is always checkpointed. 0: every boundary.
   */
  minCheckpointSeconds?: number;
  /** Seconds between fsyncs of the trace files (default 5). */
  syncSeconds?: number;
  /** Draw progress on stderr (default: when stderr is a terminal and CI is not set). */
  progress?: boolean;
  /** Keep drawing until converged instead of a fixed `draws` (true: default criteria). */
  untilConverged?: boolean | ConvergenceCriteria;
  /** Free text stored in the run folder's manifest. */
  label?: string;
}

/** Names of the {@link LongRunOptions}. */
export const longRunOptionKeys: readonly (keyof LongRunOptions)[] = [
  'threads',
  'folder',
  'checkpointEvery',
  'minCheckpointSeconds',
  'syncSeconds',
  'progress',
  'untilConverged',
  'label',
];

/**
 * True when a `runChains` call needs the runner: the target is a recipe (an object
 * with a string `module` and no `logDensityGrad`), or a long-run option is set.
 */
export function wantsRunner(target: unknown, options: unknown): boolean {
  const recipe =
    target !== null &&
    typeof target === 'object' &&
    typeof (target as { module?: unknown }).module === 'string' &&
    typeof (target as { logDensityGrad?: unknown }).logDensityGrad !== 'function';
  if (recipe) return true;
  if (options === null || typeof options !== 'object') return false;
  const o = options as Record<string, unknown>;
  return longRunOptionKeys.some((k) => o[k] !== undefined);
}

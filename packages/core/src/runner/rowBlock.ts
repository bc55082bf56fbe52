import type { TransitionStats } from '../sampler/transitionStats.js';

/** Number of per-iteration sampler statistics stored in a row. */
export const statsPerRow = 7;

/**
 * Consecutive iterations of one chain, packed in typed arrays so they can be moved
 * between threads without copying. Iteration indices count warmup.
 */
export interface RowBlock {
  readonly chain: number;
  /** Index of the first iteration in the block (0-based, warmup included). */
  readonly first: number;
  /** Number of iterations in the block. */
  count: number;
  /** count × dim positions, row-major, in the target's unconstrained coordinates. */
  readonly draws: Float64Array;
  /**
   * count × 7 statistics per row: step size, tree depth, leapfrog steps, divergent
   * (0 or 1), Hamiltonian, acceptance statistic, log density.
   */
  readonly stats: Float64Array;
  /** count × outputs values (empty when the target has no outputs). */
  readonly outputs: Float64Array;
}

/** An empty block with room for `capacity` rows. */
export function createRowBlock(chain: number, first: number, capacity: number, dim: number, outputs: number): RowBlock {
  return {
    chain,
    first,
    count: 0,
    draws: new Float64Array(capacity * dim),
    stats: new Float64Array(capacity * statsPerRow),
    outputs: new Float64Array(capacity * outputs),
  };
}

/** Writes one transition's statistics into row `row` of a packed stats array. */
export function packStats(stats: Float64Array, row: number, s: TransitionStats): void {
  const k = row * statsPerRow;
  stats[k] = s.stepSize;
  stats[k + 1] = s.treeDepth;
  stats[k + 2] = s.leapfrogSteps;
  stats[k + 3] = s.divergent ? 1 : 0;
  stats[k + 4] = s.energy;
  stats[k + 5] = s.acceptance;
  stats[k + 6] = s.logDensity;
}

/** A block cut to its filled rows (views, no copy). */
export function trimRowBlock(block: RowBlock, dim: number, outputs: number): RowBlock {
  return {
    chain: block.chain,
    first: block.first,
    count: block.count,
    draws: block.draws.subarray(0, block.count * dim),
    stats: block.stats.subarray(0, block.count * statsPerRow),
    outputs: block.outputs.subarray(0, block.count * outputs),
  };
}

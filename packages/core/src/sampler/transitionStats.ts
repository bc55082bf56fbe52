/** What one transition (one iteration of a chain) reports. */
export interface TransitionStats {
  /** Step size ε used (after jitter, for static HMC). In the target's coordinates. */
  stepSize: number;
  /** NUTS: number of trajectory doublings (1 … maxTreeDepth). Static HMC: 0. */
  treeDepth: number;
  /** Leapfrog steps, that is gradient evaluations, spent on this transition. */
  leapfrogSteps: number;
  /** True when the trajectory hit an energy error above 1000 or a non-finite value. */
  divergent: boolean;
  /** Hamiltonian H = −log p + kinetic energy at the returned state (for E-BFMI). */
  energy: number;
  /** NUTS: mean Metropolis acceptance over the new trajectory points; HMC: min(1, e^{−ΔH}). */
  acceptance: number;
  /** log p of the returned position (up to the target's constant). */
  logDensity: number;
}

/** Per-draw statistics of one chain as columns, one entry per iteration. */
export interface StatsColumns {
  readonly stepSize: Float64Array;
  readonly treeDepth: Int32Array;
  readonly leapfrogSteps: Int32Array;
  /** 1 for a divergent transition, else 0. */
  readonly divergent: Uint8Array;
  readonly energy: Float64Array;
  readonly acceptance: Float64Array;
  readonly logDensity: Float64Array;
}

/** Empty columns for `length` iterations. */
export function createStatsColumns(length: number): StatsColumns {
  return {
    stepSize: new Float64Array(length),
    treeDepth: new Int32Array(length),
    leapfrogSteps: new Int32Array(length),
    divergent: new Uint8Array(length),
    energy: new Float64Array(length),
    acceptance: new Float64Array(length),
    logDensity: new Float64Array(length),
  };
}

/** Writes one transition's statistics into row `row`. */
export function recordStats(columns: StatsColumns, row: number, stats: TransitionStats): void {
  columns.stepSize[row] = stats.stepSize;
  columns.treeDepth[row] = stats.treeDepth;
  columns.leapfrogSteps[row] = stats.leapfrogSteps;
  columns.divergent[row] = stats.divergent ? 1 : 0;
  columns.energy[row] = stats.energy;
  columns.acceptance[row] = stats.acceptance;
  columns.logDensity[row] = stats.logDensity;
}

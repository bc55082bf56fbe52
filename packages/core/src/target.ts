/**
 * The one seam between models and samplers.
 *
 * A target is a log-density over an unconstrained real vector of length `dim`.
 * Samplers see nothing else, which keeps them float64, TensorFlow.js-free and
 * testable on analytic densities.
 */
export interface Target {
  /** Number of unconstrained coordinates. */
  readonly dim: number;
  /**
   * Returns log p(x) up to an additive constant and writes d log p / dx into `grad`
   * (length `dim`). May return a non-finite value; samplers treat that as zero density.
   */
  logDensityGrad(x: Float64Array, grad: Float64Array): number;
  /** Optional names of the unconstrained coordinates (length `dim`). */
  readonly names?: readonly string[];
  /**
   * Optional map from an unconstrained position to constrained, named values and
   * derived quantities. Built by the modelling layer; `runChains` records its output
   * for every draw beside the raw draws.
   */
  readonly outputs?: TargetOutputs;
}

/** Constrained values and derived quantities recorded for each draw. */
export interface TargetOutputs {
  /** Column names, e.g. `period`, `offset[2]`, `planetMass`. */
  readonly names: readonly string[];
  /** Writes the outputs for position `x` into `out` (length `names.length`). */
  write(x: Float64Array, out: Float64Array): void;
}

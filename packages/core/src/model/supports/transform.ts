/**
 * A bijection (or, for angles, a surjection with a radial density) between a block
 * of the unconstrained position and one parameter's constrained values. All float64,
 * no TensorFlow.js. Blocks are addressed by (array, offset) so that compiled models
 * call these on their own buffers without allocating.
 */
export interface Transform {
  /** Number of constrained values (the parameter's length). */
  readonly constrainedLength: number;
  /** Number of unconstrained coordinates. */
  readonly unconstrainedLength: number;
  /**
   * Writes θ = f(u) into `theta[thetaAt …]` and returns log |det ∂θ/∂u|, the term
   * that makes the density over u correct. (For an angle it returns the log of the
   * radial density term instead; see {@link angle}.)
   */
  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number;
  /**
   * Writes u = f⁻¹(θ) into `u[uAt …]`. Returns false, leaving `u` unspecified, when θ
   * lies outside the support.
   */
  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean;
  /**
   * Chain rule: writes `gU[gUAt …] = (∂θ/∂u)ᵀ · gTheta[gThetaAt …] + ∇ᵤ log|det ∂θ/∂u|`,
   * for θ = f(u) as written by {@link forward} at the same u.
   */
  backward(
    u: Float64Array,
    uAt: number,
    theta: Float64Array,
    thetaAt: number,
    gTheta: Float64Array,
    gThetaAt: number,
    gU: Float64Array,
    gUAt: number,
  ): void;
}

/** Description of a parameter's support, bound to a length by {@link Support.bind}. */
export interface Support {
  /** Short name of the support, e.g. `interval`. */
  readonly kind: SupportKind;
  /** Lower bound of every constrained element (may be −∞). */
  readonly lower: number;
  /** Upper bound of every constrained element (may be +∞). */
  readonly upper: number;
  /** True when the support constrains a vector as a whole (ordered, simplex). */
  readonly joint: boolean;
  /** Smallest parameter length the support accepts (2 for a simplex, else 1). */
  readonly minLength: number;
  /** Number of unconstrained coordinates for a parameter of length `n`. */
  unconstrainedLength(n: number): number;
  /** The transform for a parameter of length `n`. */
  bind(n: number): Transform;
  /**
   * Name of unconstrained coordinate `k` of a parameter called `name` (its
   * constrained element names are `name` or `name[i]`).
   */
  coordinateName(name: string, n: number, scalar: boolean, k: number): string;
  /** Human-readable description such as `interval(0, 1)`. */
  readonly description: string;
}

export type SupportKind =
  | 'real'
  | 'positive'
  | 'lowerBounded'
  | 'upperBounded'
  | 'interval'
  | 'ordered'
  | 'angle'
  | 'simplex'
  | 'unitDisk';

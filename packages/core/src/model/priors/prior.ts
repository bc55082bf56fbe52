/**
 * A source of randomness for prior sampling. `RandomStream` from `@apsis/core`
 * satisfies it; tests may pass any object with these two methods.
 */
export interface RandomSource {
  /** Uniform on the open interval (0, 1). */
  uniform(): number;
  /** Standard normal deviate. */
  normal(): number;
}

/**
 * A prior for each element of a parameter, applied independently to every element of
 * a vector. Log-densities are exactly normalised over [lower, upper] (apart from
 * {@link flat}) and computed in float64.
 */
export interface ScalarPrior {
  readonly kind: string;
  /** E.g. `normal(0, 10)`. */
  readonly description: string;
  /** Lower end of the density's support (may be −∞). */
  readonly lower: number;
  /** Upper end of the density's support (may be +∞). */
  readonly upper: number;
  /** False only for improper priors ({@link flat}); they cannot be sampled. */
  readonly proper: boolean;
  /** True when the density is meant for angles: a density on the circle (−π, π]. */
  readonly circular: boolean;
  /** ln p(x); −∞ outside the support. */
  logDensity(x: number): number;
  /** d ln p(x) / dx. */
  logDensityDerivative(x: number): number;
  /** One draw, when the prior can be sampled. */
  readonly sample?: (source: RandomSource) => number;
}

/**
 * A prior on a whole vector parameter (the Dirichlet on a simplex). The density is
 * with respect to Lebesgue measure on the first n − 1 elements of the simplex.
 */
export interface VectorPrior {
  readonly kind: string;
  readonly description: string;
  readonly lower: number;
  readonly upper: number;
  readonly proper: boolean;
  /** Support kinds the prior is defined on. */
  readonly supportKinds: readonly string[];
  /** Accepted vector length (undefined: any). */
  readonly length?: number;
  /** ln p(x[at … at + n)). */
  logDensity(x: Float64Array, at: number, n: number): number;
  /** Adds ∂ ln p / ∂xᵢ into g[gAt + i]. */
  addGradient(x: Float64Array, at: number, n: number, g: Float64Array, gAt: number): void;
  /** Writes one draw into out[at … at + n). */
  readonly sample?: (source: RandomSource, out: Float64Array, at: number, n: number) => void;
}

export type Prior = ScalarPrior | VectorPrior;

/** Tells the two prior kinds apart. */
export function isVectorPrior(prior: Prior): prior is VectorPrior {
  return 'supportKinds' in prior;
}

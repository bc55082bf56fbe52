/**
 * Gaussian benchmark targets with known covariance, built from seeded streams.
 * Gradients are plain float64 loops: the dense one is the honest cost of a
 * dim-dimensional correlated Gaussian (one dim × dim matrix-vector product).
 */
import type { Target } from '@apsis/core';
// The sampler tests' random rotation (Gram–Schmidt twice on Gaussian columns), so that
// both use one generator.
import { randomOrthogonal } from '../../packages/core/test/support/targets.js';

/** A zero-mean Gaussian target with its covariance (row-major, dim × dim) and marginal variances. */
export interface GaussianBenchTarget {
  readonly target: Target;
  readonly dim: number;
  /** Marginal variances of the coordinates. */
  readonly variances: Float64Array;
  /** Covariance matrix, row-major (null when only the variances are kept, for large dim). */
  readonly covariance: Float64Array | null;
}

function fromEigen(q: Float64Array, lambda: Float64Array, n: number): Float64Array {
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += q[i * n + k] * lambda[k] * q[j * n + k];
      out[i * n + j] = s;
      out[j * n + i] = s;
    }
  }
  return out;
}

/** log p = −½ xᵀ P x for a dense precision P (row-major): one matrix-vector product. */
export function densePrecisionTarget(precision: Float64Array, dim: number): Target {
  return {
    dim,
    logDensityGrad(x: Float64Array, g: Float64Array): number {
      let s = 0;
      for (let i = 0; i < dim; i++) {
        let gi = 0;
        const row = i * dim;
        for (let j = 0; j < dim; j++) gi -= precision[row + j] * x[j];
        g[i] = gi;
        s += x[i] * gi;
      }
      return 0.5 * s;
    },
  };
}

/**
 * A `dim`-D zero-mean Gaussian whose covariance has eigenvalues log-spaced from
 * 1/√c to √c (condition number `condition`), rotated by a random orthogonal matrix
 * drawn from the stream seeded by `seedText`. Dense precision, so every gradient costs
 * dim² multiply-adds.
 */
export function rotatedGaussian(dim: number, condition: number, seedText: string): GaussianBenchTarget {
  const q = randomOrthogonal(dim, seedText);
  const lambda = new Float64Array(dim);
  const inv = new Float64Array(dim);
  const lo = -0.5 * Math.log10(condition);
  for (let k = 0; k < dim; k++) {
    lambda[k] = 10 ** (lo + (Math.log10(condition) * k) / Math.max(1, dim - 1));
    inv[k] = 1 / lambda[k];
  }
  const covariance = fromEigen(q, lambda, dim);
  const precision = fromEigen(q, inv, dim);
  const variances = new Float64Array(dim);
  for (let i = 0; i < dim; i++) variances[i] = covariance[i * dim + i];
  return { target: densePrecisionTarget(precision, dim), dim, variances, covariance };
}

/**
 * A mildly correlated `dim`-D Gaussian: a stationary AR(1) sequence with unit variances
 * and lag-one correlation `rho` (covariance ρ^|i−j|, condition number ((1+ρ)/(1−ρ))²).
 * Its precision is tridiagonal, so the gradient is O(dim). `rho` = 0 gives iid N(0, 1).
 */
export function autoregressiveGaussian(dim: number, rho: number): GaussianBenchTarget {
  const c = 1 / (1 - rho * rho);
  const interior = (1 + rho * rho) * c;
  const off = -rho * c;
  return {
    dim,
    variances: new Float64Array(dim).fill(1),
    covariance: null,
    target: {
      dim,
      logDensityGrad(x: Float64Array, g: Float64Array): number {
        if (dim === 1) {
          g[0] = -x[0];
          return -0.5 * x[0] * x[0];
        }
        let s = 0;
        for (let i = 0; i < dim; i++) {
          const diag = i === 0 || i === dim - 1 ? c : interior;
          let gi = -diag * x[i];
          if (i > 0) gi -= off * x[i - 1];
          if (i < dim - 1) gi -= off * x[i + 1];
          g[i] = gi;
          s += x[i] * gi;
        }
        return 0.5 * s;
      },
    },
  };
}

import { logLogistic, logistic } from '../math/logistic.js';
import type { Support, Transform } from './transform.js';

/**
 * The unit simplex {x : xₖ > 0, Σ xₖ = 1} of n elements, by stick breaking (common
 * practice): for k = 0 … n − 2, zₖ = σ(uₖ − log(n − 1 − k)), xₖ = sₖ zₖ with the
 * remaining stick s₀ = 1, sₖ₊₁ = sₖ (1 − zₖ), and x_{n−1} = s_{n−1}. The offsets
 * log(n − 1 − k) put u = 0 at the centre x = (1/n, …, 1/n).
 *
 * The density is with respect to Lebesgue measure on the first n − 1 elements. The
 * map u → (x₀ … x_{n−2}) is lower triangular with diagonal sₖ zₖ (1 − zₖ), so
 * log|det| = Σₖ [log zₖ + log(1 − zₖ) + log sₖ] = Σₖ [log zₖ + (n − 1 − k) log(1 − zₖ)],
 * whose derivative in uₖ is (1 − zₖ) − (n − 1 − k) zₖ.
 */
class SimplexTransform implements Transform {
  readonly unconstrainedLength: number;
  private readonly offsets: Float64Array;
  constructor(readonly constrainedLength: number) {
    this.unconstrainedLength = constrainedLength - 1;
    this.offsets = new Float64Array(this.unconstrainedLength);
    for (let k = 0; k < this.unconstrainedLength; k++) this.offsets[k] = Math.log(constrainedLength - 1 - k);
  }

  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number {
    const m = this.unconstrainedLength;
    let stick = 1;
    let logJ = 0;
    for (let k = 0; k < m; k++) {
      const v = u[uAt + k] - this.offsets[k];
      const z = logistic(v);
      theta[thetaAt + k] = stick * z;
      logJ += logLogistic(v) + (m - k) * logLogistic(-v);
      stick *= logistic(-v);
    }
    theta[thetaAt + m] = stick;
    return logJ;
  }

  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean {
    const n = this.constrainedLength;
    let total = 0;
    for (let k = 0; k < n; k++) {
      const x = theta[thetaAt + k];
      if (!(x > 0) || !Number.isFinite(x)) return false;
      total += x;
    }
    if (Math.abs(total - 1) > 1e-9 * n) return false;
    // Remaining stick from suffix sums, accumulated into u first (no allocation), so
    // rounding in the input sum does not pile up in the last coordinates.
    let rest = 0;
    for (let k = n - 2; k >= 0; k--) {
      rest += theta[thetaAt + k + 1];
      u[uAt + k] = rest;
    }
    let stick = 1;
    for (let k = 0; k < n - 1; k++) {
      const tail = u[uAt + k];
      if (!(tail > 0)) return false;
      // z = x / s and 1 − z = tail / s, so logit z = log x − log tail.
      u[uAt + k] = Math.log(theta[thetaAt + k]) - Math.log(tail) + this.offsets[k];
      stick = tail;
    }
    return stick > 0;
  }

  backward(
    u: Float64Array,
    uAt: number,
    theta: Float64Array,
    thetaAt: number,
    gTheta: Float64Array,
    gThetaAt: number,
    gU: Float64Array,
    gUAt: number,
  ): void {
    const m = this.unconstrainedLength;
    // Reverse sweep over xₖ = sₖ zₖ, sₖ₊₁ = sₖ (1 − zₖ); sₖ = sₖ₊₁ + xₖ from θ.
    let stick = theta[thetaAt + m];
    let gStick = gTheta[gThetaAt + m];
    for (let k = m - 1; k >= 0; k--) {
      const xk = theta[thetaAt + k];
      const sk = stick + xk;
      const v = u[uAt + k] - this.offsets[k];
      const z = logistic(v);
      const oneMinusZ = logistic(-v);
      const gx = gTheta[gThetaAt + k];
      const gz = (gx - gStick) * sk;
      gStick = gx * z + gStick * oneMinusZ;
      gU[gUAt + k] = gz * z * oneMinusZ + oneMinusZ - (m - k) * z;
      stick = sk;
    }
  }
}

/** Vectors of n ≥ 2 positive elements summing to one (n − 1 unconstrained coordinates). */
export function simplex(): Support {
  return {
    kind: 'simplex',
    description: 'simplex()',
    lower: 0,
    upper: 1,
    joint: true,
    minLength: 2,
    unconstrainedLength: (n) => n - 1,
    bind: (n) => new SimplexTransform(n),
    coordinateName: (name, _n, _scalar, k) => `${name}.u[${k}]`,
  };
}

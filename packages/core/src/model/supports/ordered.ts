import type { Support, Transform } from './transform.js';

/**
 * Strictly increasing vectors: θ₀ = u₀, θₖ = θₖ₋₁ + exp(uₖ) for k ≥ 1.
 * The Jacobian is triangular with diagonal (1, e^{u₁}, …), so log|det| = Σ_{k≥1} uₖ.
 */
class OrderedTransform implements Transform {
  readonly unconstrainedLength: number;
  constructor(readonly constrainedLength: number) {
    this.unconstrainedLength = constrainedLength;
  }

  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number {
    let current = u[uAt];
    theta[thetaAt] = current;
    let logJ = 0;
    for (let k = 1; k < this.constrainedLength; k++) {
      const uk = u[uAt + k];
      current += Math.exp(uk);
      theta[thetaAt + k] = current;
      logJ += uk;
    }
    return logJ;
  }

  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean {
    const first = theta[thetaAt];
    if (!Number.isFinite(first)) return false;
    u[uAt] = first;
    for (let k = 1; k < this.constrainedLength; k++) {
      const gap = theta[thetaAt + k] - theta[thetaAt + k - 1];
      if (!(gap > 0) || !Number.isFinite(gap)) return false;
      u[uAt + k] = Math.log(gap);
    }
    return true;
  }

  backward(
    u: Float64Array,
    uAt: number,
    _theta: Float64Array,
    _thetaAt: number,
    gTheta: Float64Array,
    gThetaAt: number,
    gU: Float64Array,
    gUAt: number,
  ): void {
    // ∂θⱼ/∂uₖ = e^{uₖ} for j ≥ k ≥ 1 and 1 for k = 0, so column k sums the tail of gθ.
    let tail = 0;
    for (let k = this.constrainedLength - 1; k >= 1; k--) {
      tail += gTheta[gThetaAt + k];
      gU[gUAt + k] = tail * Math.exp(u[uAt + k]) + 1;
    }
    gU[gUAt] = tail + gTheta[gThetaAt];
  }
}

/** Strictly increasing vectors of real numbers. */
export function ordered(): Support {
  return {
    kind: 'ordered',
    description: 'ordered()',
    lower: -Infinity,
    upper: Infinity,
    joint: true,
    minLength: 1,
    unconstrainedLength: (n) => n,
    bind: (n) => new OrderedTransform(n),
    coordinateName: (name, _n, scalar, k) => (scalar ? `${name}.u` : `${name}.u[${k}]`),
  };
}

import type { Support, SupportKind, Transform } from './transform.js';

/** Scalar pieces of an elementwise bijection θ = f(u). */
export interface ScalarBijection {
  forward(u: number): number;
  inverse(theta: number): number;
  /** log |dθ/du| at u. */
  logJacobian(u: number): number;
  /** dθ/du at u. */
  derivative(u: number): number;
  /** d log|dθ/du| / du at u. */
  logJacobianDerivative(u: number): number;
  /** Whether θ lies strictly inside the support. */
  contains(theta: number): boolean;
}

class ElementwiseTransform implements Transform {
  readonly unconstrainedLength: number;
  constructor(
    readonly constrainedLength: number,
    private readonly f: ScalarBijection,
  ) {
    this.unconstrainedLength = constrainedLength;
  }

  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number {
    const f = this.f;
    let logJ = 0;
    for (let i = 0; i < this.constrainedLength; i++) {
      const ui = u[uAt + i];
      theta[thetaAt + i] = f.forward(ui);
      logJ += f.logJacobian(ui);
    }
    return logJ;
  }

  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean {
    const f = this.f;
    for (let i = 0; i < this.constrainedLength; i++) {
      const t = theta[thetaAt + i];
      if (!f.contains(t)) return false;
      u[uAt + i] = f.inverse(t);
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
    const f = this.f;
    for (let i = 0; i < this.constrainedLength; i++) {
      const ui = u[uAt + i];
      gU[gUAt + i] = gTheta[gThetaAt + i] * f.derivative(ui) + f.logJacobianDerivative(ui);
    }
  }
}

/** A support whose bijection acts on each element separately. */
export function elementwiseSupport(
  kind: SupportKind,
  description: string,
  lower: number,
  upper: number,
  f: ScalarBijection,
  identity = false,
): Support {
  return {
    kind,
    description,
    lower,
    upper,
    joint: false,
    minLength: 1,
    unconstrainedLength: (n) => n,
    bind: (n) => new ElementwiseTransform(n, f),
    coordinateName: (name, _n, scalar, k) =>
      identity ? (scalar ? name : `${name}[${k}]`) : scalar ? `${name}.u` : `${name}.u[${k}]`,
  };
}

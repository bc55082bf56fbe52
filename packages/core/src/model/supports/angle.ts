import { SupportArgumentError } from '../errors.js';
import type { Support, Transform } from './transform.js';

/**
 * Angles in radians on (−π, π], each sampled through a point (a, b) of the plane with
 * θ = atan2(b, a). The map (a, b) → θ forgets the radius r = √(a² + b²), so the
 * modelling layer gives r its own proper density g(r), here log-normal,
 * ln r ~ Normal(0, s²) with s = `radialScale`. In polar coordinates da db = r dr dθ,
 * so the density over (a, b) that yields the angle's prior p(θ) exactly as a marginal is
 * p(θ) g(r) / r, and the "log-Jacobian" term this transform returns is
 * ln g(r) − ln r = −2 ln r − (ln r)²/(2s²) − ln(s √(2π)).
 *
 * The log-normal radius keeps draws away from the origin (where θ would vary wildly)
 * and away from infinity: the density over (a, b) falls like exp(−(ln r)²/(2s²))/r²
 * both ways. A smaller s narrows the ring (shorter steps when θ is diffuse); a larger s
 * widens the cone that a well-determined θ traces (tangential width ∝ r). The default
 * s = 0.25 keeps r within a factor e^{±0.5} for 95% of the draws.
 *
 * Inverse: θ → (cos θ, sin θ), the point at r = 1.
 */
class AngleTransform implements Transform {
  readonly unconstrainedLength: number;
  private readonly halfInvScale2: number;
  private readonly invScale2: number;
  private readonly logNorm: number;
  constructor(readonly constrainedLength: number, radialScale: number) {
    this.unconstrainedLength = 2 * constrainedLength;
    this.invScale2 = 1 / (radialScale * radialScale);
    this.halfInvScale2 = 0.5 * this.invScale2;
    this.logNorm = Math.log(radialScale * Math.sqrt(2 * Math.PI));
  }

  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number {
    let term = 0;
    for (let i = 0; i < this.constrainedLength; i++) {
      const a = u[uAt + 2 * i];
      const b = u[uAt + 2 * i + 1];
      theta[thetaAt + i] = Math.atan2(b, a);
      const logR = 0.5 * Math.log(a * a + b * b);
      term += -2 * logR - this.halfInvScale2 * logR * logR - this.logNorm;
    }
    return term;
  }

  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean {
    for (let i = 0; i < this.constrainedLength; i++) {
      const t = theta[thetaAt + i];
      if (!Number.isFinite(t)) return false;
      u[uAt + 2 * i] = Math.cos(t);
      u[uAt + 2 * i + 1] = Math.sin(t);
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
    for (let i = 0; i < this.constrainedLength; i++) {
      const a = u[uAt + 2 * i];
      const b = u[uAt + 2 * i + 1];
      const r2 = a * a + b * b;
      const logR = 0.5 * Math.log(r2);
      // d/dr of the radial term is −(2 + ln r / s²)/r; dr/da = a/r.
      const radial = -(2 + logR * this.invScale2) / r2;
      const g = gTheta[gThetaAt + i];
      // dθ/da = −b/r², dθ/db = a/r².
      gU[gUAt + 2 * i] = (-g * b) / r2 + radial * a;
      gU[gUAt + 2 * i + 1] = (g * a) / r2 + radial * b;
    }
  }
}

/** Options of {@link angle}. */
export interface AngleOptions {
  /** Standard deviation s of ln r for the auxiliary radius (default 0.25). */
  readonly radialScale?: number;
}

/**
 * Angles in radians on (−π, π], sampled through a 2-D unconstrained point per angle
 * (see the class notes above for the radial density). The prior of an angle must be a
 * density on the circle: uniform (the default) or a periodic custom prior.
 */
export function angle(options: AngleOptions = {}): Support {
  const s = options.radialScale ?? 0.25;
  if (typeof s !== 'number' || !Number.isFinite(s) || !(s > 0)) {
    throw new SupportArgumentError('angle.radialScale', s, 'a finite number > 0');
  }
  return {
    kind: 'angle',
    description: s === 0.25 ? 'angle()' : `angle({ radialScale: ${s} })`,
    lower: -Math.PI,
    upper: Math.PI,
    joint: false,
    minLength: 1,
    unconstrainedLength: (n) => 2 * n,
    bind: (n) => new AngleTransform(n, s),
    coordinateName: (name, _n, _scalar, k) => `${name}.u[${k}]`,
  };
}

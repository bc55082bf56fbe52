/**
 * The open unit disk {(x, y) : x² + y² < 1} as the support of a 2-vector, through the
 * radial map of the plane (u ∈ ℝ²)
 *
 *   (x, y) = t(r) u,   r = |u|,   t(r) = tanh(r)/r   (t(0) = 1),
 *
 * so the radius ρ = tanh r and the direction of u is kept. The map is smooth at the
 * origin (t is an even analytic function of r) and sends the disk's rim to infinity.
 * For a radial map x = g(r) u/r of the plane, det ∂x/∂u = g'(r) g(r)/r (standard
 * calculus), here
 *
 *   log|det| = ln sech² r + ln t(r) = −2 ln cosh r + ln(tanh r / r),
 *
 * which falls like −2r far out: a uniform density on the disk becomes a density over u
 * with exponential tails, which suits HMC. The eccentricity vector
 * (√e cos ω, √e sin ω) is sampled on this support: its origin (e = 0) is an interior
 * point, so near-circular orbits are no boundary case. A radius R < 1 scales the map
 * (x, y) = R t(r) u, adding 2 ln R to log|det| (an eccentricity capped at R²).
 *
 * Gradient: with ∂xᵢ/∂uⱼ = t δᵢⱼ + q uᵢ uⱼ, q = t'(r)/r = (sech² r − t)/r²
 * = (2r − sinh 2r)/(2 r³ cosh² r) (no cancellation: the series of 2r − sinh 2r has
 * terms of one sign), and ∇ᵤ log|det| = (−2t + q/t) u.
 */
import { SupportArgumentError } from '../errors.js';
import type { Support, Transform } from './transform.js';

/** ln cosh r for r ≥ 0 without overflow. */
function logCosh(r: number): number {
  return r + Math.log1p(Math.exp(-2 * r)) - Math.LN2;
}

/** t(r) = tanh(r)/r, t(0) = 1. */
function ratio(r: number): number {
  return r === 0 ? 1 : Math.tanh(r) / r;
}

/** q(r) = (2r − sinh 2r)/(2 r³ cosh² r), q(0) = −2/3. */
function curvature(r: number): number {
  if (r > 20) return -1 / (r * r * r); // tanh r = 1 and 1/cosh² r < 1e-17 here
  const x = 2 * r;
  if (x < 0.5) {
    const x2 = x * x;
    // 2r − sinh 2r = −x³ S with S = 1/3! + x²/5! + x⁴/7! + …, and 2 r³ = x³/4, so
    // q = −4 S / cosh² r, exact as r → 0 (q(0) = −2/3).
    const series = 1 / 6 + x2 * (1 / 120 + x2 * (1 / 5040 + x2 * (1 / 362880 + x2 * (1 / 39916800 + x2 / 6227020800))));
    const c = Math.cosh(r);
    return (-4 * series) / (c * c);
  }
  const c = Math.cosh(r);
  return (x - Math.sinh(x)) / (2 * r * r * r * c * c);
}

class UnitDiskTransform implements Transform {
  readonly constrainedLength = 2;
  readonly unconstrainedLength = 2;
  private readonly logArea: number;
  constructor(private readonly radius: number) {
    this.logArea = 2 * Math.log(radius);
  }

  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number {
    const a = u[uAt];
    const b = u[uAt + 1];
    const r = Math.hypot(a, b);
    const t = ratio(r);
    theta[thetaAt] = this.radius * t * a;
    theta[thetaAt + 1] = this.radius * t * b;
    return -2 * logCosh(r) + Math.log(t) + this.logArea;
  }

  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean {
    const x = theta[thetaAt] / this.radius;
    const y = theta[thetaAt + 1] / this.radius;
    if (!Number.isFinite(x) || !Number.isFinite(y)) return false;
    const rho = Math.hypot(x, y);
    if (!(rho < 1)) return false;
    const scale = rho === 0 ? 1 : Math.atanh(rho) / rho;
    u[uAt] = scale * x;
    u[uAt + 1] = scale * y;
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
    const a = u[uAt];
    const b = u[uAt + 1];
    const r = Math.hypot(a, b);
    const t = ratio(r);
    const q = curvature(r);
    const gx = this.radius * gTheta[gThetaAt];
    const gy = this.radius * gTheta[gThetaAt + 1];
    const dot = a * gx + b * gy;
    const radial = -2 * t + q / t;
    gU[gUAt] = t * gx + q * a * dot + radial * a;
    gU[gUAt + 1] = t * gy + q * b * dot + radial * b;
  }
}

/**
 * The open disk of the given radius (default 1) for a parameter of size 2: the map of
 * the file notes, scaled by the radius (log|det| gains 2 ln radius). Its prior must be a
 * vector prior for this kind (supportKinds including 'unitDisk'); the models package's
 * eccentricity builders supply one.
 */
export function unitDisk(radius = 1): Support {
  if (typeof radius !== 'number' || !(radius > 0 && radius <= 1)) {
    throw new SupportArgumentError('unitDisk.radius', radius, 'a number in (0, 1]');
  }
  return {
    kind: 'unitDisk',
    description: radius === 1 ? 'unitDisk()' : `unitDisk(${radius})`,
    lower: -radius,
    upper: radius,
    joint: true,
    minLength: 2,
    unconstrainedLength: (n) => n,
    bind: (n) => {
      if (n !== 2) throw new SupportArgumentError('unitDisk size', n, 'exactly 2 (one point of the disk)');
      return new UnitDiskTransform(radius);
    },
    coordinateName: (name, _n, _scalar, k) => `${name}.u[${k}]`,
  };
}


/**
 * A support re-centred and re-scaled in its own unconstrained space: the sampler's
 * coordinate u is mapped to the base support's coordinate v = c + s·u (elementwise),
 * then through the base bijection. log|det| gains Σ ln s (a constant) and the gradient
 * is s times the base gradient. The constrained values and the density they carry are
 * unchanged; only the sampler's coordinates move, so that u = 0 is a chosen point
 * (the builders' starting guess or posterior mode) and one unit of u is about one
 * posterior standard deviation.
 *
 * For a parameter on the real line this is the numerics policy's "float64 reference
 * plus a small offset in units that keep the unconstrained scale near 1": a period is
 * P = P_ref + s·u in float64, with s perhaps 1e-7 days.
 */
import type { Support, Transform } from '@apsis/core';

class CentredTransform implements Transform {
  readonly constrainedLength: number;
  readonly unconstrainedLength: number;
  private readonly v: Float64Array;
  private readonly gv: Float64Array;
  private readonly logScale: number;

  constructor(
    private readonly base: Transform,
    private readonly centre: Float64Array,
    private readonly scale: Float64Array,
  ) {
    this.constrainedLength = base.constrainedLength;
    this.unconstrainedLength = base.unconstrainedLength;
    this.v = new Float64Array(this.unconstrainedLength);
    this.gv = new Float64Array(this.unconstrainedLength);
    let l = 0;
    for (let i = 0; i < scale.length; i++) l += Math.log(scale[i]);
    this.logScale = l;
  }

  private load(u: Float64Array, uAt: number): void {
    for (let i = 0; i < this.unconstrainedLength; i++) this.v[i] = this.centre[i] + this.scale[i] * u[uAt + i];
  }

  forward(u: Float64Array, uAt: number, theta: Float64Array, thetaAt: number): number {
    this.load(u, uAt);
    return this.base.forward(this.v, 0, theta, thetaAt) + this.logScale;
  }

  inverse(theta: ArrayLike<number>, thetaAt: number, u: Float64Array, uAt: number): boolean {
    if (!this.base.inverse(theta, thetaAt, this.v, 0)) return false;
    for (let i = 0; i < this.unconstrainedLength; i++) u[uAt + i] = (this.v[i] - this.centre[i]) / this.scale[i];
    return true;
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
    this.load(u, uAt);
    this.base.backward(this.v, 0, theta, thetaAt, gTheta, gThetaAt, this.gv, 0);
    for (let i = 0; i < this.unconstrainedLength; i++) gU[gUAt + i] = this.scale[i] * this.gv[i];
  }
}

/**
 * `base` with its unconstrained coordinates v = centre + scale·u. `centre` and
 * `scale` have one entry per unconstrained coordinate of the parameter (so a scalar
 * parameter has one of each); every scale must be finite and > 0.
 */
export function centredSupport(base: Support, centre: ArrayLike<number>, scale: ArrayLike<number>): Support {
  const c = Float64Array.from(centre);
  const s = Float64Array.from(scale);
  if (c.length !== s.length) throw new RangeError(`centredSupport: ${c.length} centres but ${s.length} scales`);
  for (let i = 0; i < s.length; i++) {
    if (!(s[i] > 0 && s[i] < Infinity)) throw new RangeError(`centredSupport: scale[${i}] = ${s[i]}: expected a finite number > 0`);
    if (!Number.isFinite(c[i])) throw new RangeError(`centredSupport: centre[${i}] = ${c[i]}: expected a finite number`);
  }
  return {
    kind: base.kind,
    description: `centred(${base.description})`,
    lower: base.lower,
    upper: base.upper,
    joint: base.joint,
    minLength: base.minLength,
    unconstrainedLength: (n) => base.unconstrainedLength(n),
    bind: (n) => {
      const t = base.bind(n);
      if (t.unconstrainedLength !== c.length) {
        throw new RangeError(`centredSupport: ${c.length} centres for ${t.unconstrainedLength} unconstrained coordinates`);
      }
      return new CentredTransform(t, c, s);
    },
    coordinateName: (name, _n, scalar, k) => (scalar ? `${name}.u` : `${name}.u[${k}]`),
  };
}

/**
 * The (q1, q2) parametrisation of quadratic limb darkening (Kipping 2013, MNRAS 435,
 * 2152): u1 = 2 √q1 q2, u2 = √q1 (1 - 2 q2). The unit square in (q1, q2) maps one to
 * one onto the physical region u1 + u2 ≤ 1 (intensity non-negative at the limb),
 * u1 ≥ 0 (brightest at the centre), u1 + 2 u2 ≥ 0 (intensity decreasing outward), so
 * q1, q2 independently uniform on [0, 1] is a uniform prior over that region. The map
 * has Jacobian determinant -1 everywhere: the implied prior density of (u1, u2) is
 * uniform too (the region's area is 1), and the log-Jacobian of the change is 0.
 */
import { TransitParameterError } from './errors.js';
import { checkScalar, finiteRule, unitIntervalRule } from './validation.js';

/** Quadratic limb-darkening coefficients. */
export interface QuadraticLimbDarkening {
  u1: number;
  u2: number;
}

/** Kipping's (2013) sampling coordinates, each in [0, 1]. */
export interface KippingLimbDarkening {
  q1: number;
  q2: number;
}

/** (u1, u2) from (q1, q2) in [0, 1]² (Kipping 2013, eqs. 15-16). */
export function limbDarkeningFromKipping(q1: number, q2: number): QuadraticLimbDarkening {
  checkScalar(unitIntervalRule, q1, 'q1');
  checkScalar(unitIntervalRule, q2, 'q2');
  const r = Math.sqrt(q1);
  return { u1: 2 * r * q2, u2: r * (1 - 2 * q2) };
}

/**
 * (q1, q2) from (u1, u2) (Kipping 2013, eqs. 17-18): q1 = (u1 + u2)², q2 = u1/(2(u1 + u2)).
 * Both lie in [0, 1] exactly when (u1, u2) is physical (see {@link isPhysicalLimbDarkening}).
 * At u1 + u2 = 0 (q1 = 0) q2 is undetermined; 0.5 is returned.
 */
export function kippingFromLimbDarkening(u1: number, u2: number): KippingLimbDarkening {
  checkScalar(finiteRule, u1, 'u1');
  checkScalar(finiteRule, u2, 'u2');
  const s = u1 + u2;
  return { q1: s * s, q2: s === 0 ? 0.5 : u1 / (2 * s) };
}

/**
 * True when I(mu) = 1 - u1 (1 - mu) - u2 (1 - mu)² is non-negative, brightest at the
 * centre and non-increasing outward: u1 + u2 ≤ 1, u1 ≥ 0, u1 + 2 u2 ≥ 0 (Kipping 2013,
 * eqs. 8-10, boundaries included).
 */
export function isPhysicalLimbDarkening(u1: number, u2: number): boolean {
  return u1 + u2 <= 1 && u1 >= 0 && u1 + 2 * u2 >= 0;
}

/**
 * Jacobian of (u1, u2) with respect to (q1, q2), row-major into out[at..at+3]:
 * [∂u1/∂q1, ∂u1/∂q2, ∂u2/∂q1, ∂u2/∂q2] = [q2/√q1, 2√q1, (1 - 2 q2)/(2√q1), -2√q1].
 * For chaining d/du into d/dq. Requires q1 > 0 (the map is not differentiable at q1 = 0).
 */
export function kippingJacobianInto(q1: number, q2: number, out: Float64Array, at = 0): void {
  checkScalar(unitIntervalRule, q1, 'q1');
  checkScalar(unitIntervalRule, q2, 'q2');
  if (!(q1 > 0)) throw new TransitParameterError('q1', q1, 'q1 > 0 (the map is not differentiable at q1 = 0)');
  if (!(out instanceof Float64Array) || !(Number.isInteger(at) && at >= 0 && at + 4 <= out.length)) {
    throw new TransitParameterError('out', out, `a Float64Array with room for 4 values from offset ${String(at)}`);
  }
  const r = Math.sqrt(q1);
  out[at] = q2 / r;
  out[at + 1] = 2 * r;
  out[at + 2] = (1 - 2 * q2) / (2 * r);
  out[at + 3] = -2 * r;
}

/**
 * Relative flux of a star with quadratic limb darkening,
 *   I(μ)/I(1) = 1 - u1 (1 - μ) - u2 (1 - μ)²,
 * occulted by an opaque disk of radius k (stellar radii) whose centre is at projected
 * distance z (stellar radii) from the star's centre: the analytic solution of Mandel &
 * Agol (2002, ApJ 580, L171), with exact partial derivatives in z, k, u1 and u2 (the
 * quantities Pál 2008, MNRAS 390, 281 differentiates). See `occultedIntegrals.ts` for
 * the closed forms and how they are kept accurate at every special point.
 *
 * Writing I = c0 + c1 μ + c2 μ² with c0 = 1 - u1 - u2, c1 = u1 + 2 u2, c2 = -u2, the
 * blocked light is N = (c0 + c2)·area + c1·lin - c2·r2 and the unocculted star gives
 * F0 = π (1 - u1/3 - u2/6), so flux = 1 - N / F0.
 */
import { OCC_AREA, OCC_AREA_DK, OCC_AREA_DZ, OCC_LIN, OCC_LIN_DK, OCC_LIN_DZ, OCC_R2, OCC_R2_DK, OCC_R2_DZ, OCC_SIZE, occultedIntegralsInPlace } from './occultedIntegrals.js';
import { TransitParameterError } from './errors.js';
import { checkScalar, finiteRule, nonNegativeRule, positiveRule } from './validation.js';

const PI = Math.PI;
const integrals = new Float64Array(OCC_SIZE);

/** Offsets of the values written by {@link quadraticTransitFluxWithPartials}. */
export const FLUX_VALUE = 0;
export const FLUX_DZ = 1;
export const FLUX_DK = 2;
export const FLUX_DU1 = 3;
export const FLUX_DU2 = 4;
/** Number of values written by {@link quadraticTransitFluxWithPartials}. */
export const FLUX_PARTIALS_SIZE = 5;

/** Relative flux without input checks (z ≥ 0, k > 0, 1 - u1/3 - u2/6 > 0, all finite). */
export function quadraticFluxUnchecked(z: number, k: number, u1: number, u2: number): number {
  if (z >= 1 + k) return 1;
  if (k >= 1 && z <= k - 1) return 0;
  integrals[0] = z;
  occultedIntegralsInPlace(k, false, integrals, 0);
  const blocked = (1 - u1 - 2 * u2) * integrals[OCC_AREA] + (u1 + 2 * u2) * integrals[OCC_LIN] + u2 * integrals[OCC_R2];
  return 1 - blocked / (PI * (1 - u1 / 3 - u2 / 6));
}

/**
 * Relative flux and its four partials without input checks; writes
 * [flux, ∂/∂z, ∂/∂k, ∂/∂u1, ∂/∂u2] at out[at..at+4] and returns the flux.
 */
export function quadraticFluxPartialsUnchecked(
  z: number,
  k: number,
  u1: number,
  u2: number,
  out: Float64Array,
  at: number,
): number {
  out[at] = z;
  quadraticFluxPartialsInPlace(k, u1, u2, out, at);
  return out[at];
}

/**
 * {@link quadraticFluxPartialsUnchecked} with z read from out[at] and nothing returned
 * (the flux is out[at]), for loops over points: V8 does not inline it there, and a
 * double passed to or returned from a call that is not inlined is boxed, one heap
 * allocation each per point. Same results, bit for bit.
 */
export function quadraticFluxPartialsInPlace(k: number, u1: number, u2: number, out: Float64Array, at: number): void {
  const z = out[at];
  if (z >= 1 + k) {
    out[at] = 1;
    out[at + 1] = 0;
    out[at + 2] = 0;
    out[at + 3] = 0;
    out[at + 4] = 0;
    return;
  }
  if (k >= 1 && z <= k - 1) {
    out[at] = 0;
    out[at + 1] = 0;
    out[at + 2] = 0;
    out[at + 3] = 0;
    out[at + 4] = 0;
    return;
  }
  integrals[0] = z;
  occultedIntegralsInPlace(k, true, integrals, 0);
  const area = integrals[OCC_AREA];
  const lin = integrals[OCC_LIN];
  const r2 = integrals[OCC_R2];
  const w0 = 1 - u1 - 2 * u2;
  const w1 = u1 + 2 * u2;
  const invF0 = 1 / (PI * (1 - u1 / 3 - u2 / 6));
  const blocked = w0 * area + w1 * lin + u2 * r2;
  const ratio = blocked * invF0;
  out[at] = 1 - ratio;
  out[at + 1] = -(w0 * integrals[OCC_AREA_DZ] + w1 * integrals[OCC_LIN_DZ] + u2 * integrals[OCC_R2_DZ]) * invF0;
  out[at + 2] = -(w0 * integrals[OCC_AREA_DK] + w1 * integrals[OCC_LIN_DK] + u2 * integrals[OCC_R2_DK]) * invF0;
  // d(1/F0)/du1 = (pi/3) invF0², d(1/F0)/du2 = (pi/6) invF0².
  out[at + 3] = -(lin - area) * invF0 - ratio * (PI / 3) * invF0;
  out[at + 4] = -(2 * (lin - area) + r2) * invF0 - ratio * (PI / 6) * invF0;
}

function checkFluxArguments(z: unknown, k: unknown, u1: unknown, u2: unknown): void {
  checkScalar(nonNegativeRule, z, 'z');
  checkScalar(positiveRule, k, 'k');
  checkScalar(finiteRule, u1, 'u1');
  checkScalar(finiteRule, u2, 'u2');
  const total = 1 - (u1 as number) / 3 - (u2 as number) / 6;
  if (!(total > 0)) {
    throw new TransitParameterError('u1, u2', `${String(u1)}, ${String(u2)}`, 'limb-darkening coefficients with 1 - u1/3 - u2/6 > 0 (positive total stellar flux)');
  }
}

/**
 * Relative flux (1 out of transit) of a quadratically limb-darkened star occulted by
 * an opaque planet, float64, Mandel & Agol (2002).
 *
 * @param z projected separation of the centres, stellar radii, z ≥ 0.
 * @param k planet-to-star radius ratio, k > 0 (k > 1 allowed).
 * @param u1 linear limb-darkening coefficient.
 * @param u2 quadratic limb-darkening coefficient; 1 - u1/3 - u2/6 must be positive.
 * @throws TransitParameterError naming the offending argument.
 */
export function quadraticTransitFlux(z: number, k: number, u1: number, u2: number): number {
  checkFluxArguments(z, k, u1, u2);
  return quadraticFluxUnchecked(z, k, u1, u2);
}

/**
 * Relative flux and its exact partial derivatives, without allocating: writes
 * [flux, ∂flux/∂z, ∂flux/∂k, ∂flux/∂u1, ∂flux/∂u2] into `out[at..at+4]` and returns
 * the flux. Arguments as for {@link quadraticTransitFlux}; z and k in stellar radii.
 * At z = 0 the derivative in z is 0 (the flux is even in z).
 */
export function quadraticTransitFluxWithPartials(
  z: number,
  k: number,
  u1: number,
  u2: number,
  out: Float64Array,
  at = 0,
): number {
  checkFluxArguments(z, k, u1, u2);
  if (!(out instanceof Float64Array) || !(Number.isInteger(at) && at >= 0 && at + FLUX_PARTIALS_SIZE <= out.length)) {
    throw new TransitParameterError('out', out, `a Float64Array with room for ${FLUX_PARTIALS_SIZE} values from offset ${String(at)}`);
  }
  return quadraticFluxPartialsUnchecked(z, k, u1, u2, out, at);
}

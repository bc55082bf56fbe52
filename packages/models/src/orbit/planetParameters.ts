/**
 * Layout of the planet parameter vector shared by the radial-velocity kernels and ops.
 *
 * Each planet takes `PLANET_STRIDE` = 5 consecutive float64 slots:
 *   [period P (days), tc (days, time of inferior conjunction relative to the caller's
 *    reference epoch), a, b, semi-amplitude K (m/s)]
 * where (a, b) = (e, omega) in the polar form, or (sqrt(e) cos omega, sqrt(e) sin omega)
 * in the root form. Gradients use the same layout.
 */
import { conjunctionMeanAnomalyUnchecked } from './anomalies.js';

/** Slots per planet in a parameter vector. */
export const PLANET_STRIDE = 5;

/** How eccentricity and argument of periastron are written in a parameter vector. */
export type EccentricityForm = 'polar' | 'root';

/** Names of the slots of planet `p` (0-based), e.g. `period[0]`, `h[0]`. */
export function planetParameterNames(p: number, form: EccentricityForm): string[] {
  const ab = form === 'polar' ? ['eccentricity', 'omega'] : ['h', 'k'];
  return ['period', 'tc', ab[0], ab[1], 'semiAmplitude'].map((n) => `${n}[${p}]`);
}

/** Slots per planet in a decoded block (see {@link decodePlanets}). */
export const DECODED_STRIDE = 12;
// Offsets inside a decoded block.
export const D_P = 0; // period, days
export const D_TC = 1; // conjunction time, days
export const D_E = 2; // eccentricity
export const D_W = 3; // omega, radians
export const D_K = 4; // semi-amplitude, m/s
export const D_N = 5; // mean motion 2 pi / P, rad/day
export const D_MC = 6; // mean anomaly at conjunction, rad
export const D_SW = 7; // sin omega
export const D_CW = 8; // cos omega
export const D_ROOT = 9; // sqrt(1 - e^2)
export const D_H = 10; // sqrt(e) cos omega (root form) or 0
export const D_KK = 11; // sqrt(e) sin omega (root form) or 0

/**
 * Decodes `planets` planets from `params` (layout above) into `decoded`
 * (`DECODED_STRIDE` slots per planet) with the per-planet constants the kernels use.
 * Returns false if any value is outside its support (non-finite, P <= 0, e outside
 * [0, 1)); the decoded contents are then unspecified.
 */
export function decodePlanets(
  params: Float64Array,
  planets: number,
  form: EccentricityForm,
  decoded: Float64Array,
): boolean {
  for (let p = 0; p < planets; p++) {
    const at = p * PLANET_STRIDE;
    const P = params[at];
    const tc = params[at + 1];
    const a = params[at + 2];
    const b = params[at + 3];
    const K = params[at + 4];
    if (!(P > 0 && P < Infinity) || !Number.isFinite(tc) || !Number.isFinite(K)) return false;
    if (!Number.isFinite(a) || !Number.isFinite(b)) return false;
    let e: number;
    let w: number;
    if (form === 'polar') {
      e = a;
      w = b;
    } else {
      e = a * a + b * b;
      w = e === 0 ? 0 : Math.atan2(b, a);
    }
    if (!(e >= 0 && e < 1)) return false;
    const o = p * DECODED_STRIDE;
    decoded[o + D_P] = P;
    decoded[o + D_TC] = tc;
    decoded[o + D_E] = e;
    decoded[o + D_W] = w;
    decoded[o + D_K] = K;
    decoded[o + D_N] = (2 * Math.PI) / P;
    decoded[o + D_MC] = conjunctionMeanAnomalyUnchecked(e, w);
    decoded[o + D_SW] = Math.sin(w);
    decoded[o + D_CW] = Math.cos(w);
    decoded[o + D_ROOT] = Math.sqrt((1 - e) * (1 + e));
    decoded[o + D_H] = form === 'root' ? a : 0;
    decoded[o + D_KK] = form === 'root' ? b : 0;
  }
  return true;
}

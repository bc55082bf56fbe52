/**
 * Layout of the float64 parameter vector of the light-curve kernels, and the decoded
 * per-planet constants the inner loops read.
 *
 * Each planet takes `TRANSIT_PLANET_STRIDE` = 7 consecutive slots:
 *   [period P (days), tc (days, time of inferior conjunction relative to the caller's
 *    reference epoch), eccentricity e, argument of periastron omega (radians),
 *    a/R_* (scaled semi-major axis) or the mean stellar density rho_* (kg m^-3),
 *    impact parameter b or inclination i (radians), radius ratio k = R_p/R_*]
 * followed, once per light curve, by the quadratic limb-darkening coefficients
 * [u1, u2] (the star's, shared by all its planets). Gradients use the same layout.
 *
 * Gradients in slot 4 and slot 0 include the density-to-a/R_* chain rule when the
 * density form is used.
 *
 * Geometry conventions (Winn 2010, "Transits and Occultations", eqs. 2-4 and 7):
 * X = -r cos(omega + f), Y = -r sin(omega + f) cos i, Z = r sin(omega + f) sin i in
 * stellar radii, r = (a/R_*)(1 - e²)/(1 + e cos f); the planet is in front when Z > 0;
 * conjunction (mid-transit) at f = pi/2 - omega; b = (a/R_*) cos i (1 - e²)/(1 + e sin omega).
 */

import { GRAVITATIONAL_CONSTANT, SECONDS_PER_DAY } from '../orbit/constants.js';

/** Slots per planet in a light-curve parameter vector. */
export const TRANSIT_PLANET_STRIDE = 7;
/** Offsets inside a planet's block. */
export const TP_PERIOD = 0;
export const TP_TC = 1;
export const TP_ECCENTRICITY = 2;
export const TP_OMEGA = 3;
export const TP_SCALED_AXIS = 4;
export const TP_ANGLE = 5;
export const TP_RADIUS_RATIO = 6;

/** How slot 5 of each planet is written: impact parameter b or inclination i (radians). */
export type TransitAngleForm = 'impact' | 'inclination';

/**
 * How slot 4 of each planet is written: the scaled semi-major axis a/R_*, or the mean
 * stellar density rho_* in kg m^-3, from which a/R_* = (G rho_* P²/(3 pi))^{1/3}
 * (Seager & Mallén-Ornelas 2003, planet mass neglected). With several planets in the
 * density form, give each the same density (or tie them in the model).
 */
export type TransitScaleForm = 'scaledSemiMajorAxis' | 'stellarDensity';

/** Length of a light-curve parameter vector: 7 per planet plus u1, u2. */
export function transitParameterCount(planets: number): number {
  return planets * TRANSIT_PLANET_STRIDE + 2;
}

/** Names of all slots, e.g. `period[0]`, ..., `radiusRatio[1]`, `u1`, `u2`. */
export function transitParameterNames(
  planets: number,
  angle: TransitAngleForm,
  scale: TransitScaleForm = 'scaledSemiMajorAxis',
): string[] {
  const names: string[] = [];
  const slots = [
    'period',
    'tc',
    'eccentricity',
    'omega',
    scale,
    angle === 'impact' ? 'impactParameter' : 'inclination',
    'radiusRatio',
  ];
  for (let p = 0; p < planets; p++) for (const s of slots) names.push(`${s}[${p}]`);
  names.push('u1', 'u2');
  return names;
}

/** Slots per planet in a decoded block (see {@link decodeTransitPlanets}). */
export const TD_STRIDE = 24;
export const TD_PERIOD = 0;
export const TD_TC = 1;
export const TD_E = 2;
export const TD_SCALED_AXIS = 3;
export const TD_K = 4;
export const TD_N = 5; // mean motion 2 pi / P, rad/day
export const TD_MC = 6; // mean anomaly at conjunction, rad
export const TD_SW = 7; // sin omega
export const TD_CW = 8; // cos omega
export const TD_ROOT = 9; // sqrt(1 - e²)
export const TD_COS_I = 10;
export const TD_MC_DE = 11; // dMc/de
export const TD_MC_DW = 12; // dMc/domega
export const TD_CI_DE = 13; // d cos i / de (impact form; 0 for inclination)
export const TD_CI_DW = 14; // d cos i / domega
export const TD_CI_DA = 15; // d cos i / d(a/R_*)
export const TD_CI_DANGLE = 16; // d cos i / db, or d cos i / di = -sin i
export const TD_WINDOW_LO = 17; // earliest time offset from tc that can be in transit (<= 0), days
export const TD_WINDOW_HI = 18; // latest time offset from tc that can be in transit (>= 0), days
export const TD_WINDOWED = 19; // 1: window narrower than the period; 2: never overlaps; 0: no window
export const TD_SIN_EC = 20; // sin of the eccentric anomaly at conjunction
export const TD_COS_EC = 21; // cos of the eccentric anomaly at conjunction
export const TD_AR_DSLOT = 22; // d(a/R_*)/d(slot 4): 1, or d(a/R_*)/d rho_*
export const TD_AR_DP = 23; // d(a/R_*)/dP at fixed slot 4: 0, or 2 (a/R_*)/(3P)

const HALF_PI = Math.PI / 2;

/**
 * Mean anomaly at inferior conjunction (f = pi/2 - omega) and its partial derivatives,
 * written into d[o + TD_MC], d[o + TD_MC_DE], d[o + TD_MC_DW]. With f_c the true
 * anomaly at conjunction: sin E_c = √(1 - e²) cos omega / (1 + e sin omega),
 * cos E_c = (e + sin omega)/(1 + e sin omega), M_c = E_c - e sin E_c;
 * dM/df = (1 - e²)^{3/2}/(1 + e cos f)² and
 * ∂M/∂e|_f = -√(1 - e²) sin f (2 + e cos f)/(1 + e cos f)² (standard calculus).
 */
function conjunctionInto(e: number, sw: number, cw: number, root: number, d: Float64Array, o: number): void {
  const den = 1 + e * sw;
  const Ec = Math.atan2(root * cw, e + sw);
  d[o + TD_MC] = Ec - (e * root * cw) / den;
  d[o + TD_SIN_EC] = (root * cw) / den;
  d[o + TD_COS_EC] = (e + sw) / den;
  d[o + TD_MC_DW] = -(root * root * root) / (den * den);
  d[o + TD_MC_DE] = (-root * cw * (2 + e * sw)) / (den * den);
}

/** Mean anomaly of true anomaly f (radians, in (-pi, pi]). */
function meanFromTrue(f: number, e: number, root: number): number {
  const cf = Math.cos(f);
  const E = Math.atan2(root * Math.sin(f), e + cf);
  return E - (e * root * Math.sin(f)) / (1 + e * cf);
}

function wrapPositive(x: number): number {
  const t = 2 * Math.PI;
  return x - t * Math.floor(x / t);
}

/** √(reach² - r² cos² i)/(r sin i), or -1 when reach² ≤ r² cos² i. */
function cosineBound(reach2: number, r: number, ci: number, si: number): number {
  const chord2 = reach2 - r * r * ci * ci;
  return chord2 > 0 ? Math.sqrt(chord2) / (si * r) : -1;
}

/**
 * The time window around each conjunction outside which the planet cannot overlap the
 * star. Since z² = C² + S² cos² i with C = r cos(omega + f), S² = r² - C²,
 * z² = C² sin² i + r² cos² i; overlap (z < 1 + k) with the planet in front
 * (sin(omega + f) > 0) therefore needs |cos(omega + f)| < √((1 + k)² - r_min² cos² i)
 * / (r_min sin i), with r_min the smallest star-planet distance over that arc:
 * periastron distance first, then the smaller end of the arc (which only narrows it).
 * If (1 + k)² ≤ r_min² cos² i the planet never overlaps the star. Written as time
 * offsets from tc, widened by a relative margin for rounding.
 */
function windowInto(d: Float64Array, o: number, omega: number): void {
  const e = d[o + TD_E];
  const aR = d[o + TD_SCALED_AXIS];
  const k = d[o + TD_K];
  const root = d[o + TD_ROOT];
  const P = d[o + TD_PERIOD];
  const ci = d[o + TD_COS_I];
  const si = Math.sqrt((1 - ci) * (1 + ci));
  d[o + TD_WINDOWED] = 0;
  d[o + TD_WINDOW_LO] = -P;
  d[o + TD_WINDOW_HI] = P;
  const reach2 = (1 + k) * (1 + k);
  let rMin = aR * (1 - e);
  let c0 = cosineBound(reach2, rMin, ci, si);
  if (c0 < 0) {
    d[o + TD_WINDOWED] = 2; // never overlaps
    return;
  }
  if (!(c0 < 1)) return;
  const fc = HALF_PI - omega;
  let half = Math.asin(c0);
  // Refine once: r(f) over [fc - half, fc + half] is smallest at an end, unless the
  // arc contains periastron (f = 0 mod 2 pi).
  const lo = fc - half;
  const containsPeriastron = wrapPositive(-lo) < 2 * half;
  if (!containsPeriastron) {
    const p = aR * root * root;
    const r1 = p / (1 + e * Math.cos(fc - half));
    const r2 = p / (1 + e * Math.cos(fc + half));
    rMin = Math.min(r1, r2);
    c0 = cosineBound(reach2, rMin, ci, si);
    if (c0 < 0) {
      d[o + TD_WINDOWED] = 2;
      return;
    }
    half = Math.asin(Math.min(1, c0));
  }
  const Mc = d[o + TD_MC];
  const n = d[o + TD_N];
  const after = wrapPositive(meanFromTrue(fc + half, e, root) - Mc);
  const before = wrapPositive(Mc - meanFromTrue(fc - half, e, root));
  if (!(after + before < 2 * Math.PI * (1 - 1e-6))) return;
  const margin = 1e-9 * P + 1e-12;
  d[o + TD_WINDOW_LO] = -before / n - margin;
  d[o + TD_WINDOW_HI] = after / n + margin;
  d[o + TD_WINDOWED] = 1;
}

/**
 * Decodes `planets` planets of `params` (layout in the file comment) into `decoded`
 * (`TD_STRIDE` slots per planet). Returns -1 if all values are inside their support,
 * else the index of the first offending slot: non-finite values, P ≤ 0, e outside
 * [0, 1), a/R_* ≤ 1, k ≤ 0, an inclination outside (0, pi), or an impact parameter
 * the orbit cannot reach (|cos i| ≥ 1). u1, u2 are checked by the caller.
 */
export function decodeTransitPlanets(
  params: Float64Array,
  planets: number,
  angle: TransitAngleForm,
  decoded: Float64Array,
  scaleForm: TransitScaleForm = 'scaledSemiMajorAxis',
): number {
  for (let p = 0; p < planets; p++) {
    const at = p * TRANSIT_PLANET_STRIDE;
    const P = params[at + TP_PERIOD];
    const tc = params[at + TP_TC];
    const e = params[at + TP_ECCENTRICITY];
    const w = params[at + TP_OMEGA];
    const slot4 = params[at + TP_SCALED_AXIS];
    const g = params[at + TP_ANGLE];
    const k = params[at + TP_RADIUS_RATIO];
    if (!(P > 0 && P < Infinity)) return at + TP_PERIOD;
    if (!Number.isFinite(tc)) return at + TP_TC;
    if (!(e >= 0 && e < 1)) return at + TP_ECCENTRICITY;
    if (!Number.isFinite(w)) return at + TP_OMEGA;
    const o = p * TD_STRIDE;
    let aR = slot4;
    if (scaleForm === 'stellarDensity') {
      if (!(slot4 > 0 && slot4 < Infinity)) return at + TP_SCALED_AXIS;
      const seconds = P * SECONDS_PER_DAY;
      aR = Math.cbrt((GRAVITATIONAL_CONSTANT * slot4 * seconds * seconds) / (3 * Math.PI));
      decoded[o + TD_AR_DSLOT] = aR / (3 * slot4);
      decoded[o + TD_AR_DP] = (2 * aR) / (3 * P);
    } else {
      decoded[o + TD_AR_DSLOT] = 1;
      decoded[o + TD_AR_DP] = 0;
    }
    if (!(aR > 1 && aR < Infinity)) return at + TP_SCALED_AXIS;
    if (!(k > 0 && k < Infinity)) return at + TP_RADIUS_RATIO;
    const sw = Math.sin(w);
    const cw = Math.cos(w);
    const root = Math.sqrt((1 - e) * (1 + e));
    let ci: number;
    if (angle === 'impact') {
      if (!Number.isFinite(g)) return at + TP_ANGLE;
      const den = 1 + e * sw;
      const scale = den / (aR * root * root);
      ci = g * scale;
      if (!(Math.abs(ci) < 1)) return at + TP_ANGLE;
      decoded[o + TD_CI_DANGLE] = scale;
      decoded[o + TD_CI_DA] = -ci / aR;
      decoded[o + TD_CI_DE] = (g * (sw * root * root + 2 * e * den)) / (aR * root * root * root * root);
      decoded[o + TD_CI_DW] = (g * e * cw) / (aR * root * root);
    } else {
      if (!(g > 0 && g < Math.PI)) return at + TP_ANGLE;
      ci = Math.cos(g);
      decoded[o + TD_CI_DANGLE] = -Math.sin(g);
      decoded[o + TD_CI_DA] = 0;
      decoded[o + TD_CI_DE] = 0;
      decoded[o + TD_CI_DW] = 0;
    }
    decoded[o + TD_PERIOD] = P;
    decoded[o + TD_TC] = tc;
    decoded[o + TD_E] = e;
    decoded[o + TD_SCALED_AXIS] = aR;
    decoded[o + TD_K] = k;
    decoded[o + TD_N] = (2 * Math.PI) / P;
    decoded[o + TD_SW] = sw;
    decoded[o + TD_CW] = cw;
    decoded[o + TD_ROOT] = root;
    decoded[o + TD_COS_I] = ci;
    conjunctionInto(e, sw, cw, root, decoded, o);
    windowInto(decoded, o, w);
  }
  return -1;
}

/**
 * Kepler's equation M = E - e sin E, solved for the eccentric anomaly E in float64.
 *
 * Method: the mean anomaly is reduced to [-pi, pi) keeping the number of whole turns,
 * folded onto [0, pi] by the odd symmetry E(-M) = -E(M), started with the cubic
 * approximation of Markley (1995, Celestial Mechanics and Dynamical Astronomy 63, 101;
 * formulas from memory, checked here against bisection) and refined with one
 * fifth-order correction (a Taylor expansion of Kepler's equation to fourth order,
 * solved by substitution). A further correction is made only when the first one was
 * large (never observed), so the iteration count is bounded by `MAX_CORRECTIONS`. The
 * sine and cosine of E are carried through the last correction by angle addition, so
 * callers that need them pay for no extra trig calls.
 */
import { OrbitParameterError } from './errors.js';

const PI = Math.PI;
const TWO_PI = 2 * Math.PI;
const PI_SQUARED = PI * PI;
const MARKLEY_A = (3 * PI_SQUARED) / (PI_SQUARED - 6);
const MARKLEY_B = (1.6 * PI) / (PI_SQUARED - 6);
/** Upper bound on Householder corrections after the starter. */
export const MAX_CORRECTIONS = 3;
/**
 * A correction below this size leaves an error at the rounding level (fifth-order
 * convergence). Measured on a grid of 1e5 mean anomalies x 13 eccentricities up to
 * 0.9999, the starter is within 4.3e-4 rad of the root, so in practice one correction is
 * made; further ones are a safety net.
 */
const CONVERGED_STEP = 2e-3;

/** Fifth-order correction of E towards the root of E - e sin E - m (after Markley 1995). */
function correction(E: number, m: number, es: number, ec: number): number {
  // Successive substitution of the Taylor series of f(E) = E - e sin E - m to fourth order.
  const f0 = E - es - m;
  const f1 = 1 - ec;
  const d3 = (-f0 * f1) / (f1 * f1 - 0.5 * f0 * es);
  const d4 = -f0 / (f1 + d3 * (0.5 * es + (d3 * ec) / 6));
  return -f0 / (f1 + d4 * (0.5 * es + d4 * (ec / 6 - (d4 * es) / 24)));
}

/**
 * Safety net, never reached on 0 <= e < 1 in our tests: further corrections with fresh
 * sin/cos, at most `MAX_CORRECTIONS - 1` of them. Writes E, sin E, cos E at out[at..].
 */
function refine(E: number, m: number, e: number, out: Float64Array, at: number): void {
  let sinE = Math.sin(E);
  let cosE = Math.cos(E);
  for (let pass = 1; pass < MAX_CORRECTIONS; pass++) {
    const d = correction(E, m, e * sinE, e * cosE);
    E += d;
    sinE = Math.sin(E);
    cosE = Math.cos(E);
    if (Math.abs(d) < 1e-15 * (1 + E)) break;
  }
  out[at] = E;
  out[at + 1] = sinE;
  out[at + 2] = cosE;
}

/**
 * Unchecked solver for hot loops with the per-eccentricity constants precomputed:
 * `oneMinusE` = 1 - e and `markleyB` = {@link markleyConstant}(e). Any finite mean anomaly
 * `M` (radians), 0 <= e < 1; writes E (radians, continuous in M: E(M + 2 pi) =
 * E(M) + 2 pi), sin E and cos E into out[at], out[at + 1], out[at + 2]. Per-point loops
 * of this package use {@link solveKeplerInPlace}, the same solver.
 */
export function solveKeplerWithConstants(
  M: number,
  e: number,
  oneMinusE: number,
  markleyB: number,
  out: Float64Array,
  at: number,
): void {
  out[at] = M;
  solveKeplerInPlace(e, oneMinusE, markleyB, out, at);
}

/**
 * {@link solveKeplerWithConstants} with the mean anomaly M read from out[at] (then
 * overwritten by E). M comes through the array because V8 does not inline the solver into the
 * per-point loops, and a double computed per point and passed to a call that is not
 * inlined is boxed, one heap allocation per call (measured: 16 bytes per solve, none
 * this way).
 */
export function solveKeplerInPlace(e: number, oneMinusE: number, markleyB: number, out: Float64Array, at: number): void {
  const M = out[at];
  // Reduce to [-pi, pi), keeping the whole turns; fold onto [0, pi] by E(-M) = -E(M).
  let turns = Math.floor((M + PI) / TWO_PI);
  let m = M - turns * TWO_PI;
  if (m >= PI) {
    m -= TWO_PI;
    turns += 1;
  } else if (m < -PI) {
    m += TWO_PI;
    turns -= 1;
  }
  const negative = m < 0;
  if (negative) m = -m;
  let E: number;
  let sinE: number;
  let cosE: number;
  if (e === 0 || m === 0) {
    E = m;
    sinE = Math.sin(m);
    cosE = Math.cos(m);
  } else {
    // Markley's starter: the root of a cubic in E from a rational approximation of
    // sin E across [0, pi] (rearranged to save divisions); within 4.3e-4 rad (measured).
    const alpha = MARKLEY_A + markleyB * (PI - m);
    const d = 3 * oneMinusE + alpha * e;
    const ad = alpha * d;
    const q = 2 * ad * oneMinusE - m * m;
    const r = (3 * ad * (d - oneMinusE) + m * m) * m;
    const w = Math.cbrt(Math.abs(r) + Math.sqrt(q * q * q + r * r));
    const w2 = w * w;
    E = ((2 * r * w2) / (w2 * w2 + w2 * q + q * q) + m) / d;
    sinE = Math.sin(E);
    cosE = Math.cos(E);
    const d5 = correction(E, m, e * sinE, e * cosE);
    E += d5;
    if (Math.abs(d5) < CONVERGED_STEP) {
      // sin/cos(E + d5) by angle addition with the Taylor series of sin d5, cos d5
      // (truncation below 1e-19 for |d5| < 2e-3): no second pair of trig calls.
      const dd = d5 * d5;
      const sd = d5 * (1 - (dd / 6) * (1 - dd / 20));
      const cd = 1 - (dd / 2) * (1 - dd / 12);
      const s = sinE * cd + cosE * sd;
      cosE = cosE * cd - sinE * sd;
      sinE = s;
    } else {
      refine(E, m, e, out, at);
      E = out[at];
      sinE = out[at + 1];
      cosE = out[at + 2];
    }
  }
  out[at] = (negative ? -E : E) + turns * TWO_PI;
  out[at + 1] = negative ? -sinE : sinE;
  out[at + 2] = cosE;
}

/** The per-eccentricity constant of Markley's starter, 1.6 pi / ((pi^2 - 6)(1 + e)). */
export function markleyConstant(e: number): number {
  return MARKLEY_B / (1 + e);
}

/**
 * Unchecked solver for hot loops: any finite mean anomaly `M` (radians) and
 * 0 <= e < 1. Writes E (radians, continuous in M: E(M + 2 pi) = E(M) + 2 pi),
 * sin E and cos E into `out[at..at+2]`. The caller guarantees the domain.
 */
export function solveKeplerInto(M: number, e: number, out: Float64Array, at = 0): void {
  out[at] = M;
  solveKeplerInPlace(e, 1 - e, MARKLEY_B / (1 + e), out, at);
}

function checkEccentricity(e: number, field: string): void {
  if (!(e >= 0 && e < 1)) throw new OrbitParameterError(field, e, 'a number in [0, 1)');
}

function checkMeanAnomaly(M: number, field: string): void {
  if (!Number.isFinite(M)) throw new OrbitParameterError(field, M, 'a finite number (radians)');
}

const scalarScratch = new Float64Array(3);

/**
 * Eccentric anomaly E (radians, float64) solving M = E - e sin E.
 *
 * @param meanAnomaly mean anomaly M in radians, any finite real; E keeps M's number of
 *   whole turns, so E(M + 2 pi) = E(M) + 2 pi.
 * @param eccentricity orbital eccentricity, 0 <= e < 1.
 * @throws OrbitParameterError if M is not finite or e is outside [0, 1).
 */
export function solveKepler(meanAnomaly: number, eccentricity: number): number {
  checkMeanAnomaly(meanAnomaly, 'meanAnomaly');
  checkEccentricity(eccentricity, 'eccentricity');
  solveKeplerInto(meanAnomaly, eccentricity, scalarScratch, 0);
  return scalarScratch[0];
}

/** Eccentric anomaly with its sine and cosine, from {@link solveKeplerWithTrig}. */
export interface EccentricAnomaly {
  /** Eccentric anomaly, radians. */
  E: number;
  sinE: number;
  cosE: number;
}

/**
 * Like {@link solveKepler}, also returning sin E and cos E (computed without extra
 * trigonometric calls).
 */
export function solveKeplerWithTrig(meanAnomaly: number, eccentricity: number): EccentricAnomaly {
  checkMeanAnomaly(meanAnomaly, 'meanAnomaly');
  checkEccentricity(eccentricity, 'eccentricity');
  solveKeplerInto(meanAnomaly, eccentricity, scalarScratch, 0);
  return { E: scalarScratch[0], sinE: scalarScratch[1], cosE: scalarScratch[2] };
}

/**
 * Vectorised Kepler solve over a `Float64Array` of mean anomalies (radians).
 *
 * @param meanAnomaly mean anomalies M, radians, finite.
 * @param eccentricity one eccentricity for all points, or one per point (same length).
 * @param outE receives E (radians); may be the same array as `meanAnomaly`.
 * @param outSinE optional, receives sin E.
 * @param outCosE optional, receives cos E.
 * @throws OrbitParameterError on a non-finite M, an eccentricity outside [0, 1) or
 *   mismatched lengths (the field names the offending index).
 */
export function solveKeplerArray(
  meanAnomaly: Float64Array,
  eccentricity: number | Float64Array,
  outE: Float64Array,
  outSinE?: Float64Array,
  outCosE?: Float64Array,
): void {
  const n = meanAnomaly.length;
  const perPoint = typeof eccentricity !== 'number';
  if (outE.length < n) throw new OrbitParameterError('outE.length', outE.length, `at least ${n}`);
  if (outSinE && outSinE.length < n) throw new OrbitParameterError('outSinE.length', outSinE.length, `at least ${n}`);
  if (outCosE && outCosE.length < n) throw new OrbitParameterError('outCosE.length', outCosE.length, `at least ${n}`);
  if (perPoint) {
    if (eccentricity.length !== n) {
      throw new OrbitParameterError('eccentricity.length', eccentricity.length, `${n} (one per mean anomaly)`);
    }
    for (let i = 0; i < n; i++) checkEccentricity(eccentricity[i], `eccentricity[${i}]`);
  } else {
    checkEccentricity(eccentricity, 'eccentricity');
  }
  for (let i = 0; i < n; i++) checkMeanAnomaly(meanAnomaly[i], `meanAnomaly[${i}]`);
  const s = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    solveKeplerInto(meanAnomaly[i], perPoint ? eccentricity[i] : eccentricity, s, 0);
    outE[i] = s[0];
    if (outSinE) outSinE[i] = s[1];
    if (outCosE) outCosE[i] = s[2];
  }
}

/**
 * Partial derivatives of E(M, e) by the implicit function theorem:
 * dE/dM = 1 / (1 - e cos E), dE/de = sin E / (1 - e cos E).
 * Writes [dE/dM, dE/de] into `out[at..at+1]`.
 */
export function keplerPartialsInto(e: number, sinE: number, cosE: number, out: Float64Array, at = 0): void {
  const inv = 1 / (1 - e * cosE);
  out[at] = inv;
  out[at + 1] = sinE * inv;
}

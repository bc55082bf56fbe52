/**
 * Rough starting estimates from the data, used as starting guesses and to centre some
 * default priors: a weighted linear least-squares fit of sinusoids at the given periods
 * to the radial velocities (Lomb 1976 and Scargle 1982 fit one sinusoid this way; here
 * all planets, instrument offsets and the trend at once), and transit depths from the
 * folded light curves.
 */
import { GRAVITATIONAL_CONSTANT, SECONDS_PER_DAY } from '../orbit/constants.js';
import type { PreparedLightCurve, PreparedRv } from './prepareInput.js';

/** Result of {@link fitSinusoids}. */
export interface SinusoidFit {
  /** Semi-amplitude per planet, m/s. */
  readonly amplitudes: Float64Array;
  /** Conjunction time per planet, days relative to the epoch, in (−P/2, P/2]. */
  readonly conjunctions: Float64Array;
  /** Offset per instrument, m/s. */
  readonly offsets: Float64Array;
  /** Trend coefficients (m/s/day, m/s/day²) as far as the degree asks. */
  readonly trend: Float64Array;
  /** Residual scatter beyond the errors per instrument, m/s (≥ 0). */
  readonly excessScatter: Float64Array;
}

/** Solves the symmetric positive definite system A x = b in place (Cholesky); A is n × n row-major. */
function solveSymmetric(A: Float64Array, b: Float64Array, n: number): Float64Array {
  const L = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j <= i; j++) {
      let s = A[i * n + j];
      for (let k = 0; k < j; k++) s -= L[i * n + k] * L[j * n + k];
      if (i === j) L[i * n + i] = Math.sqrt(Math.max(s, 1e-300));
      else L[i * n + j] = s / L[j * n + j];
    }
  }
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    let s = b[i];
    for (let k = 0; k < i; k++) s -= L[i * n + k] * y[k];
    y[i] = s / L[i * n + i];
  }
  const x = new Float64Array(n);
  for (let i = n - 1; i >= 0; i--) {
    let s = y[i];
    for (let k = i + 1; k < n; k++) s -= L[k * n + i] * x[k];
    x[i] = s / L[i * n + i];
  }
  return x;
}

/**
 * Weighted least squares of v(t) = Σ_p [a_p sin(2π t/P_p) + b_p cos(2π t/P_p)] + offset_j
 * + trend, t relative to the epoch. A circular orbit has v = −K sin(2π (t − tc)/P), so
 * K = √(a² + b²) and 2π tc/P = atan2(b, −a).
 */
export function fitSinusoids(rv: PreparedRv, epoch: number, periods: readonly number[], trendDegree: number): SinusoidFit {
  const nP = periods.length;
  const J = rv.labels.length;
  const n = 2 * nP + J + trendDegree;
  const A = new Float64Array(n * n);
  const b = new Float64Array(n);
  const row = new Float64Array(n);
  const N = rv.times.length;
  const fill = (i: number): void => {
    const t = rv.times[i] - epoch;
    row.fill(0);
    for (let p = 0; p < nP; p++) {
      const phase = (2 * Math.PI * t) / periods[p];
      row[2 * p] = Math.sin(phase);
      row[2 * p + 1] = Math.cos(phase);
    }
    row[2 * nP + rv.instrument[i]] = 1;
    for (let d = 1; d <= trendDegree; d++) row[2 * nP + J + d - 1] = t ** d;
  };
  for (let i = 0; i < N; i++) {
    fill(i);
    const w = 1 / (rv.errors[i] * rv.errors[i]);
    for (let r = 0; r < n; r++) {
      if (row[r] === 0) continue;
      b[r] += w * row[r] * rv.values[i];
      for (let c = 0; c < n; c++) A[r * n + c] += w * row[r] * row[c];
    }
  }
  // A small ridge keeps the system solvable when there are too few points or aliases.
  let trace = 0;
  for (let r = 0; r < n; r++) trace += A[r * n + r];
  for (let r = 0; r < n; r++) A[r * n + r] += 1e-9 * (trace / n) + 1e-300;
  const x = solveSymmetric(A, b, n);
  const amplitudes = new Float64Array(nP);
  const conjunctions = new Float64Array(nP);
  for (let p = 0; p < nP; p++) {
    const a = x[2 * p];
    const c = x[2 * p + 1];
    amplitudes[p] = Math.hypot(a, c);
    conjunctions[p] = (periods[p] * Math.atan2(c, -a)) / (2 * Math.PI);
  }
  const offsets = x.slice(2 * nP, 2 * nP + J);
  const trend = x.slice(2 * nP + J);
  const sumSq = new Float64Array(J);
  const sumErr = new Float64Array(J);
  const count = new Float64Array(J);
  for (let i = 0; i < N; i++) {
    fill(i);
    let model = 0;
    for (let r = 0; r < n; r++) model += row[r] * x[r];
    const j = rv.instrument[i];
    const res = rv.values[i] - model;
    sumSq[j] += res * res;
    sumErr[j] += rv.errors[i] * rv.errors[i];
    count[j]++;
  }
  const excessScatter = new Float64Array(J);
  for (let j = 0; j < J; j++) excessScatter[j] = Math.sqrt(Math.max(0, (sumSq[j] - sumErr[j]) / count[j]));
  return { amplitudes, conjunctions, offsets, trend, excessScatter };
}

/** a/R_* from a stellar density (g/cm³) and period (days): (G ρ P²/(3π))^(1/3) (Seager & Mallén-Ornelas 2003). */
export function scaledAxisFromDensity(densityCgs: number, period: number): number {
  const P = period * SECONDS_PER_DAY;
  return Math.cbrt((GRAVITATIONAL_CONSTANT * densityCgs * 1000 * P * P) / (3 * Math.PI));
}

/** Duration of a central transit of a small planet on a circular orbit, days: (P/π) asin(R_* / a). */
export function centralDuration(period: number, scaledAxis: number): number {
  return (period / Math.PI) * Math.asin(Math.min(1, 1 / scaledAxis));
}

/** Time from the nearest predicted mid-transit, days (t and tc relative to the epoch). */
function fromNearestTransit(t: number, period: number, tc: number): number {
  const dt = t - tc;
  return dt - period * Math.round(dt / period);
}

/**
 * Transit depth estimate (fraction of the flux) of a planet with period P and
 * conjunction tc (days relative to the epoch): one minus the weighted mean of the
 * normalised flux within a quarter of the expected duration of mid-transit, over all
 * light curves. Returns NaN when no point falls there.
 */
export function estimateDepth(
  lightCurves: readonly PreparedLightCurve[],
  epoch: number,
  period: number,
  tc: number,
  duration: number,
): number {
  let sw = 0;
  let swf = 0;
  for (const lc of lightCurves) {
    const sorted = Float64Array.from(lc.flux).sort();
    const median = sorted[Math.floor(sorted.length / 2)];
    for (let i = 0; i < lc.times.length; i++) {
      if (Math.abs(fromNearestTransit(lc.times[i] - epoch, period, tc)) > duration / 4) continue;
      const w = (median / lc.errors[i]) ** 2;
      sw += w;
      swf += (w * lc.flux[i]) / median;
    }
  }
  return sw > 0 ? 1 - swf / sw : NaN;
}

/** Mean of values (times, velocities) weighted by 1/σ². */
export function inverseVarianceMean(values: ArrayLike<number>, errors: ArrayLike<number>): number {
  let sw = 0;
  let swv = 0;
  for (let i = 0; i < values.length; i++) {
    const w = 1 / (errors[i] * errors[i]);
    sw += w;
    swv += w * values[i];
  }
  return swv / sw;
}

/**
 * The time that the light curves' transits of one planet centre on (days relative to the
 * epoch): the 1/σ²-weighted mean time of the points within one expected duration of a
 * predicted mid-transit (those that time the transits), or of all points when none is.
 * A conjunction near it is nearly uncorrelated with the period in the posterior (the
 * least-squares intercept at the weighted mean of the abscissae; common practice).
 */
export function transitTimingCentre(
  lightCurves: readonly PreparedLightCurve[],
  epoch: number,
  period: number,
  tc: number,
  duration: number,
): number {
  let sw = 0;
  let swt = 0;
  let swAll = 0;
  let swtAll = 0;
  for (const lc of lightCurves) {
    for (let i = 0; i < lc.times.length; i++) {
      const t = lc.times[i] - epoch;
      const w = 1 / (lc.errors[i] * lc.errors[i]);
      swAll += w;
      swtAll += w * t;
      if (Math.abs(fromNearestTransit(t, period, tc)) > duration) continue;
      sw += w;
      swt += w * t;
    }
  }
  return sw > 0 ? swt / sw : swAll > 0 ? swtAll / swAll : NaN;
}

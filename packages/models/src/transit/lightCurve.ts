/**
 * Float64 transit light-curve kernel for one set of times: several planets, quadratic
 * limb darkening, exposure-time integration by supersampling, and the exact
 * vector-Jacobian product, with all buffers allocated once.
 *
 * Model: flux(t_i) = 1 - Σ_p [1 - F_p(t_i)], each planet's F_p the Mandel & Agol
 * (2002) flux at its separation z_p(t) (planets are assumed not to overlap each other
 * on the disk). With an exposure time T_i and n sub-samples, F_p(t_i) is replaced by
 * the mean of F_p at t_i + T_i ((j + 1/2)/n - 1/2), j = 0..n-1: the midpoint rule for
 * the exposure average (Kipping 2010, MNRAS 408, 1758). Gradients are the same
 * averages of the exact partials.
 *
 * Speed: for each planet a window around conjunction outside which no overlap is
 * possible is computed once per call (`transitParameters.ts`). The times are sorted
 * once, at construction (a permutation; the identity for sorted times), and each
 * planet's windows are met by a sweep through the sorted times: from a point past the
 * current window, the next window follows from one division, and the first point that
 * can reach it from a galloping search, so points whose exposure misses every window
 * cost nothing each (the search that skips a run of d of them costs about 2 log2 d
 * comparisons). The sweep only selects candidates (a superset, by a margin far above
 * rounding); each candidate then passes the per-point phase test a scan over all
 * points would apply, so every point's flux and partials are bit-for-bit those of
 * that scan, and for unsorted times only the order of the sums over points differs.
 * Inside, each sub-sample costs one Kepler solve and one flux evaluation (two
 * short arithmetic–geometric-mean iterations).
 *
 * Parameter vector: `transitParameters.ts` (7 slots per planet, then u1, u2).
 */
import { z } from 'zod';
import { LightCurveDataError, TransitParameterError, TransitWorkspaceError } from './errors.js';
import { quadraticFluxPartialsInPlace, quadraticFluxUnchecked } from './quadraticFlux.js';
import { separationInPlace, separationPartialsInto } from './skySeparation.js';
import {
  TD_AR_DP,
  TD_AR_DSLOT,
  TD_K,
  TD_PERIOD,
  TD_STRIDE,
  TD_TC,
  TD_WINDOWED,
  TD_WINDOW_HI,
  TD_WINDOW_LO,
  TRANSIT_PLANET_STRIDE,
  decodeTransitPlanets,
  transitParameterCount,
  transitParameterNames,
  type TransitAngleForm,
  type TransitScaleForm,
} from './transitParameters.js';

/** Per-point partials stored by {@link LightCurveKernel.fluxKeepingJacobian}. */
const ROW = 9;
/**
 * Points per call of the per-planet point loop for a planet without a window. Short
 * calls let V8 compile the loop as an ordinary function rather than rely on on-stack
 * replacement of one long loop, whose code was measured in some fresh processes to run
 * several times slower (Node 20; see lightCurveLikelihood.ts).
 */
const CHUNK = 1024;

/** Options of {@link createLightCurveKernel}. */
export interface LightCurveOptions {
  /** Mid-exposure times, days relative to the caller's float64 reference epoch. */
  times: Float64Array;
  /**
   * Exposure (integration) time, days: one value for all points or one per point;
   * ≥ 0. Default 0 (instantaneous). A positive value needs `subSamples`.
   */
  exposureTime?: number | Float64Array;
  /** Sub-samples per exposure, a positive integer (Kipping 2010). Default 1. */
  subSamples?: number;
  /** Number of planets, ≥ 1. */
  planets: number;
  /** How slot 5 of each planet is written. Default 'impact'. */
  angle?: TransitAngleForm;
  /** How slot 4 of each planet is written (a/R_* or rho_* in kg m^-3). Default 'scaledSemiMajorAxis'. */
  scale?: TransitScaleForm;
}

/** A light-curve kernel bound to one set of times (see {@link createLightCurveKernel}). */
export interface LightCurveKernel {
  readonly times: Float64Array;
  readonly planets: number;
  readonly angle: TransitAngleForm;
  readonly scale: TransitScaleForm;
  readonly subSamples: number;
  /** Length of the parameter vector: 7 per planet plus u1, u2. */
  readonly parameterCount: number;
  /** Slot names, e.g. `period[0]`, ..., `u1`, `u2`. */
  readonly names: readonly string[];
  /**
   * Relative flux at every time (1 out of transit) into `out` (default: an internal
   * buffer, overwritten by the next call), returned.
   * @throws TransitParameterError naming the first slot outside its support.
   */
  flux(params: Float64Array, out?: Float64Array): Float64Array;
  /**
   * One fused pass: the flux (internal buffer, returned) and the vector-Jacobian
   * product grad[j] = Σ_i weights[i] ∂flux_i/∂params[j], written (not added) into
   * `grad` (length `parameterCount`).
   */
  vjp(params: Float64Array, weights: Float64Array, grad: Float64Array): Float64Array;
  /**
   * The flux (internal buffer, returned) with the per-point partials of the points in
   * transit kept for {@link LightCurveKernel.vjpFromLast}. Returns null instead of
   * throwing when a parameter is outside its support.
   */
  fluxKeepingJacobian(params: Float64Array): Float64Array | null;
  /** grad = Jᵀ weights for the Jacobian kept by the last `fluxKeepingJacobian` call. */
  vjpFromLast(weights: Float64Array, grad: Float64Array): void;
  /** -1 when every slot of `params` is inside its support, else the first bad slot. */
  checkParameters(params: Float64Array): number;
}

const optionsSchema = z.object({
  times: z.instanceof(Float64Array),
  exposureTime: z.union([z.number().nonnegative(), z.instanceof(Float64Array)]).optional(),
  subSamples: z.number().int().positive().optional(),
  planets: z.number().int().positive(),
  angle: z.enum(['impact', 'inclination']).optional(),
  scale: z.enum(['scaledSemiMajorAxis', 'stellarDensity']).optional(),
});

/** Times in ascending order with the permutation that sorts them, for the window sweep. */
interface TimeSweep {
  /** times[order[q]], ascending. */
  readonly sorted: Float64Array;
  readonly order: Int32Array;
  /**
   * How far (days) a window's candidate range reaches beyond the window: the longest
   * half-exposure plus a margin for the rounding of the per-point phase test, many
   * orders of magnitude above it (that test's error is a few ulps of |t|, |tc| and P).
   */
  pad(period: number, tc: number): number;
}

function createTimeSweep(times: Float64Array, maxHalf: number): TimeSweep {
  const N = times.length;
  const order = Int32Array.from({ length: N }, (_, i) => i);
  let ascending = true;
  for (let i = 1; i < N; i++) if (!(times[i] >= times[i - 1])) ascending = false;
  if (!ascending) order.sort((a, b) => times[a] - times[b] || a - b);
  const sorted = Float64Array.from(order, (i) => times[i]);
  const span = N > 0 ? Math.max(Math.abs(sorted[0]), Math.abs(sorted[N - 1])) : 0;
  return {
    sorted,
    order,
    pad: (period, tc) => maxHalf + 1e-9 * (span + Math.abs(tc) + period),
  };
}

/**
 * The first index ≥ q with sorted[index] ≥ value (> value when `strict`), or N: steps
 * of 1, 2, 4, … from q, then bisection, so a jump over d points costs about 2 log2 d
 * comparisons.
 */
function gallop(sorted: Float64Array, q: number, value: number, strict: boolean): number {
  const N = sorted.length;
  // "Before value": x < value, or x ≤ value when strict.
  if (q >= N || !(strict ? sorted[q] <= value : sorted[q] < value)) return q;
  let lo = q; // sorted[lo] is before value
  let step = 1;
  let hi = q + step;
  while (hi < N && (strict ? sorted[hi] <= value : sorted[hi] < value)) {
    lo = hi;
    step *= 2;
    hi = q + step;
  }
  if (hi > N) hi = N;
  // sorted[lo] is before value; sorted[hi] is not (or hi = N).
  while (hi - lo > 1) {
    const mid = (lo + hi) >>> 1;
    if (strict ? sorted[mid] <= value : sorted[mid] < value) lo = mid;
    else hi = mid;
  }
  return hi;
}

function fail(field: string, value: unknown, expected: string): never {
  throw new LightCurveDataError(field, undefined, value, expected);
}

/**
 * Builds a light-curve kernel for `options.times`; all work buffers (flux, per-planet
 * sparse Jacobians) are allocated here, none per call.
 *
 * @throws LightCurveDataError for malformed times, exposure times or options.
 */
export function createLightCurveKernel(options: LightCurveOptions): LightCurveKernel {
  const parsed = optionsSchema.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = String(issue.path[0] ?? 'options');
    fail(field, (options as unknown as Record<string, unknown>)?.[field], issue.message);
  }
  const { times, planets } = options;
  const angle: TransitAngleForm = options.angle ?? 'impact';
  const scale: TransitScaleForm = options.scale ?? 'scaledSemiMajorAxis';
  const N = times.length;
  for (let i = 0; i < N; i++) {
    if (!Number.isFinite(times[i])) throw new LightCurveDataError('times', i, times[i], 'a finite number (days)');
  }
  const exposure = new Float64Array(N);
  const exp = options.exposureTime ?? 0;
  if (typeof exp === 'number') exposure.fill(exp);
  else {
    if (exp.length !== N) fail('exposureTime.length', exp.length, `${N} (one per time) or a single number`);
    for (let i = 0; i < N; i++) {
      if (!(exp[i] >= 0 && exp[i] < Infinity)) throw new LightCurveDataError('exposureTime', i, exp[i], 'a finite number >= 0 (days)');
      exposure[i] = exp[i];
    }
  }
  const anyExposure = exposure.some((t) => t > 0);
  if (anyExposure && options.subSamples === undefined) {
    fail('subSamples', undefined, 'a positive integer when an exposure time is given');
  }
  const ns = options.subSamples ?? 1;
  const invNs = 1 / ns;
  const halfExposure = new Float64Array(N);
  const subStep = new Float64Array(N);
  let maxHalf = 0;
  for (let i = 0; i < N; i++) {
    halfExposure[i] = ns > 1 ? exposure[i] / 2 : 0;
    subStep[i] = exposure[i] / ns;
    if (halfExposure[i] > maxHalf) maxHalf = halfExposure[i];
  }
  const sweep = createTimeSweep(times, maxHalf);

  const dim = transitParameterCount(planets);
  const uAt = planets * TRANSIT_PLANET_STRIDE;
  const names = Object.freeze(transitParameterNames(planets, angle, scale));
  const decoded = new Float64Array(planets * TD_STRIDE);
  const flux = new Float64Array(N);
  const jacIndex: Int32Array[] = [];
  const jacRows: Float64Array[] = [];
  for (let p = 0; p < planets; p++) {
    jacIndex.push(new Int32Array(N));
    jacRows.push(new Float64Array(N * ROW));
  }
  const jacCount = new Int32Array(planets);
  // d(a/R_*)/d(slot 4) and d(a/R_*)/dP of each planet, as of the kept Jacobian.
  const keptChain = new Float64Array(2 * planets);
  let jacValid = false;
  const sep = new Float64Array(7);
  const fp = new Float64Array(5);
  const planetGrad = new Float64Array(ROW);

  function check(params: Float64Array): number {
    if (!(params instanceof Float64Array) || params.length !== dim) return -2;
    const bad = decodeTransitPlanets(params, planets, angle, decoded, scale);
    if (bad >= 0) return bad;
    const u1 = params[uAt];
    const u2 = params[uAt + 1];
    if (!Number.isFinite(u1) || !Number.isFinite(u2) || !(1 - u1 / 3 - u2 / 6 > 0)) return uAt;
    return -1;
  }

  function throwBad(params: Float64Array, bad: number): never {
    if (bad === -2) throw new TransitWorkspaceError('params', params, `a Float64Array of length ${dim}`);
    const what =
      bad >= uAt
        ? 'limb-darkening coefficients with 1 - u1/3 - u2/6 > 0'
        : 'a value inside its support (P > 0, 0 <= e < 1, a/R_* > 1 (or a density giving it), k > 0, |cos i| < 1)';
    throw new TransitParameterError(names[bad], params[bad], what);
  }

  /**
   * The light curve of all planets. mode 0: flux only; 1: flux and grad = Jᵀ weights;
   * 2: flux and the sparse Jacobian kept. Parameters must have been decoded by `check`.
   * Per planet, the candidate points (all of them without a window) go to
   * {@link planetPoints} in runs: one per window, chunks of CHUNK without one.
   */
  function run(params: Float64Array, mode: 0 | 1 | 2, weights: Float64Array | null, grad: Float64Array | null, out: Float64Array): void {
    const u1 = params[uAt];
    const u2 = params[uAt + 1];
    out.fill(1);
    if (grad) grad.fill(0);
    const sorted = sweep.sorted;
    for (let p = 0; p < planets; p++) {
      const o = p * TD_STRIDE;
      const P = decoded[o + TD_PERIOD];
      const tc = decoded[o + TD_TC];
      const windowState = decoded[o + TD_WINDOWED];
      jacCount[p] = 0;
      planetGrad.fill(0);
      if (windowState === 0) {
        for (let from = 0; from < N; from += CHUNK) planetPoints(p, u1, u2, mode, weights, out, from, Math.min(N, from + CHUNK), false);
      } else if (windowState === 1) {
        // Window m is [tc + lo + mP, tc + hi + mP]; its candidates are the sorted times
        // within `pad` of it.
        const pad = sweep.pad(P, tc);
        const first = tc + decoded[o + TD_WINDOW_LO] - pad;
        const last = tc + decoded[o + TD_WINDOW_HI] + pad;
        let q = 0;
        while (q < N) {
          // The first window whose candidate range ends at or after sorted[q].
          const tq = sorted[q];
          let m = Math.ceil((tq - last) / P);
          if (last + m * P < tq) m++;
          const from = first + m * P;
          const until = last + m * P;
          if (tq < from) {
            q = gallop(sorted, q, from, false);
            if (q >= N) break;
          }
          const end = gallop(sorted, q, until, true);
          if (end > q) planetPoints(p, u1, u2, mode, weights, out, q, end, true);
          q = end;
        }
      }
      // windowState 2: the planet never overlaps the star, flux 1 and zero partials.
      keptChain[2 * p] = decoded[o + TD_AR_DSLOT];
      keptChain[2 * p + 1] = decoded[o + TD_AR_DP];
      if (mode === 1) {
        const g = grad as Float64Array;
        const at = p * TRANSIT_PLANET_STRIDE;
        for (let j = 0; j < 7; j++) g[at + j] = planetGrad[j];
        // Density form: a/R_* depends on slot 4 and on P.
        g[at] += planetGrad[4] * decoded[o + TD_AR_DP];
        g[at + 4] = planetGrad[4] * decoded[o + TD_AR_DSLOT];
        g[uAt] += planetGrad[7];
        g[uAt + 1] += planetGrad[8];
      }
    }
  }

  /**
   * Planet p at the points of positions [from, to): sorted positions (point
   * order[q]) when `windowed`, else point indices. Each point first passes the
   * per-point phase test of its exposure against the window (the sweep's candidates
   * are a superset), then each sub-sample is evaluated. Adds the deficits into `out`,
   * and the partials into planetGrad (mode 1) or the kept Jacobian (mode 2).
   */
  function planetPoints(p: number, u1: number, u2: number, mode: 0 | 1 | 2, weights: Float64Array | null, out: Float64Array, from: number, to: number, windowed: boolean): void {
    const o = p * TD_STRIDE;
    const k = decoded[o + TD_K];
    const reach = 1 + k;
    const P = decoded[o + TD_PERIOD];
    const tc = decoded[o + TD_TC];
    const lo = decoded[o + TD_WINDOW_LO];
    const width = decoded[o + TD_WINDOW_HI] - lo;
    const withPartials = mode !== 0;
    const rows = jacRows[p];
    const index = jacIndex[p];
    const order = sweep.order;
    let count = jacCount[p];
    for (let q = from; q < to; q++) {
      const i = windowed ? order[q] : q;
      const t = times[i];
      const h = halfExposure[i];
      if (windowed) {
        let u = t - tc - lo + h;
        u -= P * Math.floor(u / P);
        if (u > width + 2 * h) continue;
      }
      const step = subStep[i];
      let deficit = 0;
      let touched = false;
      let a0 = 0;
      let a1 = 0;
      let a2 = 0;
      let a3 = 0;
      let a4 = 0;
      let a5 = 0;
      let a6 = 0;
      let a7 = 0;
      let a8 = 0;
      for (let j = 0; j < ns; j++) {
        let tj = t;
        if (ns > 1) {
          tj = t - h + step * (j + 0.5);
          if (windowed) {
            let v = tj - tc - lo;
            v -= P * Math.floor(v / P);
            if (v > width) continue;
          }
        }
        sep[0] = tj;
        const inFront = separationInPlace(decoded, o, sep, 0);
        const zj = sep[0];
        if (!inFront || zj >= reach) continue;
        touched = true;
        if (!withPartials) {
          deficit += 1 - quadraticFluxUnchecked(zj, k, u1, u2);
          continue;
        }
        separationPartialsInto(decoded, o, sep, 1);
        fp[0] = zj;
        quadraticFluxPartialsInPlace(k, u1, u2, fp, 0);
        deficit += 1 - fp[0];
        const dz = fp[1];
        a0 += dz * sep[1];
        a1 += dz * sep[2];
        a2 += dz * sep[3];
        a3 += dz * sep[4];
        a4 += dz * sep[5];
        a5 += dz * sep[6];
        a6 += fp[2];
        a7 += fp[3];
        a8 += fp[4];
      }
      if (!touched) continue;
      out[i] -= deficit * invNs;
      if (mode === 1) {
        const w = (weights as Float64Array)[i] * invNs;
        planetGrad[0] += w * a0;
        planetGrad[1] += w * a1;
        planetGrad[2] += w * a2;
        planetGrad[3] += w * a3;
        planetGrad[4] += w * a4;
        planetGrad[5] += w * a5;
        planetGrad[6] += w * a6;
        planetGrad[7] += w * a7;
        planetGrad[8] += w * a8;
      } else if (mode === 2) {
        const r = count * ROW;
        index[count++] = i;
        rows[r] = a0 * invNs;
        rows[r + 1] = a1 * invNs;
        rows[r + 2] = a2 * invNs;
        rows[r + 3] = a3 * invNs;
        rows[r + 4] = a4 * invNs;
        rows[r + 5] = a5 * invNs;
        rows[r + 6] = a6 * invNs;
        rows[r + 7] = a7 * invNs;
        rows[r + 8] = a8 * invNs;
      }
    }
    jacCount[p] = count;
  }

  function checkArray(field: string, a: Float64Array, length: number): void {
    if (!(a instanceof Float64Array) || a.length !== length) {
      throw new TransitWorkspaceError(field, a, `a Float64Array of length ${length}`);
    }
  }

  return {
    times,
    planets,
    angle,
    scale,
    subSamples: ns,
    parameterCount: dim,
    names,
    flux(params: Float64Array, out?: Float64Array): Float64Array {
      const bad = check(params);
      if (bad !== -1) throwBad(params, bad);
      const target = out ?? flux;
      if (out) checkArray('out', out, N);
      jacValid = false;
      run(params, 0, null, null, target);
      return target;
    },
    vjp(params: Float64Array, weights: Float64Array, grad: Float64Array): Float64Array {
      const bad = check(params);
      if (bad !== -1) throwBad(params, bad);
      checkArray('weights', weights, N);
      checkArray('grad', grad, dim);
      jacValid = false;
      run(params, 1, weights, grad, flux);
      return flux;
    },
    fluxKeepingJacobian(params: Float64Array): Float64Array | null {
      const bad = check(params);
      if (bad === -2) throwBad(params, bad);
      if (bad !== -1) {
        jacValid = false;
        return null;
      }
      run(params, 2, null, null, flux);
      jacValid = true;
      return flux;
    },
    vjpFromLast(weights: Float64Array, grad: Float64Array): void {
      if (!jacValid) throw new TransitWorkspaceError('vjpFromLast', 'no kept Jacobian', 'a successful fluxKeepingJacobian call first');
      checkArray('weights', weights, N);
      checkArray('grad', grad, dim);
      grad.fill(0);
      for (let p = 0; p < planets; p++) {
        const rows = jacRows[p];
        const index = jacIndex[p];
        let g0 = 0;
        let g1 = 0;
        let g2 = 0;
        let g3 = 0;
        let g4 = 0;
        let g5 = 0;
        let g6 = 0;
        let g7 = 0;
        let g8 = 0;
        for (let c = 0, r = 0; c < jacCount[p]; c++, r += ROW) {
          const w = weights[index[c]];
          g0 += w * rows[r];
          g1 += w * rows[r + 1];
          g2 += w * rows[r + 2];
          g3 += w * rows[r + 3];
          g4 += w * rows[r + 4];
          g5 += w * rows[r + 5];
          g6 += w * rows[r + 6];
          g7 += w * rows[r + 7];
          g8 += w * rows[r + 8];
        }
        const at = p * TRANSIT_PLANET_STRIDE;
        grad[at] = g0 + g4 * keptChain[2 * p + 1];
        grad[at + 1] = g1;
        grad[at + 2] = g2;
        grad[at + 3] = g3;
        grad[at + 4] = g4 * keptChain[2 * p];
        grad[at + 5] = g5;
        grad[at + 6] = g6;
        grad[uAt] += g7;
        grad[uAt + 1] += g8;
      }
    },
    checkParameters(params: Float64Array): number {
      const bad = check(params);
      return bad === -2 ? 0 : bad;
    },
  };
}

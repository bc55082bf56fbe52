/**
 * Gaussian log-likelihood of radial-velocity data under a sum of Keplerian planets,
 * per-instrument offsets and jitters and an optional polynomial trend, with its exact
 * gradient, in float64, in two passes over the data.
 *
 * Model for point i (time t_i, value y_i, error sigma_i, instrument j = inst_i):
 *   mu_i  = sum_p v_p(t_i) + offset_j + c1 (t_i - t0) + c2 (t_i - t0)^2
 *   var_i = sigma_i^2 + jitter_j^2
 *   log L = -1/2 sum_i [ (y_i - mu_i)^2 / var_i + ln(2 pi var_i) ]
 * Gradients: d log L / d mu_i = r_i / var_i (r = y - mu), chained through the planet
 * kernel; d/d offset_j = sum_{i in j} r_i/var_i; d/d jitter_j = jitter_j sum_{i in j}
 * (r_i^2/var_i^2 - 1/var_i); d/d c_m = sum_i (r_i/var_i) (t_i - t0)^m.
 */
import { z } from 'zod';
import { OrbitParameterError, RvDataError } from './errors.js';
import {
  DECODED_STRIDE,
  PLANET_STRIDE,
  decodePlanets,
  planetParameterNames,
  type EccentricityForm,
} from './planetParameters.js';
import { addPlanetCurve, planetVjpFromCache } from './rvPlanetLoops.js';

const LN_2PI = Math.log(2 * Math.PI);

/** Data and model shape for {@link createRvLikelihood}. */
export interface RvLikelihoodOptions {
  /** Observation times, days relative to the caller's float64 reference epoch. */
  times: Float64Array;
  /** Measured stellar velocities, m/s. */
  values: Float64Array;
  /** One-sigma measurement errors, m/s, positive. */
  errors: Float64Array;
  /** Instrument index of each point, 0 .. instruments - 1. */
  instrument: Int32Array;
  /** Number of instruments (each has an offset and a jitter). */
  instruments: number;
  /** Number of Keplerian planets (0 allowed: offsets and trend only). */
  planets: number;
  /** How slots 2 and 3 of each planet are written; default 'polar' (e, omega). */
  eccentricityForm?: EccentricityForm;
  /** Trend degree: 0 none, 1 linear, 2 quadratic. Default 0. */
  trendDegree?: 0 | 1 | 2;
  /** Reference epoch t0 of the trend, days (same system as `times`). Default 0. */
  trendEpoch?: number;
}

/**
 * A ready log-likelihood over one float64 parameter vector, laid out as
 *   [planet 0 (5 slots) ... planet P-1, offset[0..J-1] (m/s), jitter[0..J-1] (m/s),
 *    trend coefficients c1 (m/s/day), c2 (m/s/day^2) as far as the degree asks]
 * with the planet slots of `planetParameters.ts`. Jitter enters as its square.
 */
export interface RvLikelihood {
  readonly dim: number;
  readonly names: readonly string[];
  /** Index of the first offset, first jitter and first trend coefficient in the vector. */
  readonly offsetIndex: number;
  readonly jitterIndex: number;
  readonly trendIndex: number;
  /**
   * Returns log L and writes d log L / d params into `grad` (length `dim`).
   * Returns -Infinity (grad zero-filled) for parameters outside their support.
   */
  logLikelihoodGrad(params: Float64Array, grad: Float64Array): number;
  /** log L alone (same pass 1, no gradient). */
  logLikelihood(params: Float64Array): number;
  /** The model mean mu_i (m/s) at the parameters of the last call, for residuals. */
  readonly lastModel: Float64Array;
}

const optionsSchema = z.object({
  times: z.instanceof(Float64Array),
  values: z.instanceof(Float64Array),
  errors: z.instanceof(Float64Array),
  instrument: z.instanceof(Int32Array),
  instruments: z.number().int().min(1),
  planets: z.number().int().min(0),
  eccentricityForm: z.enum(['polar', 'root']).optional(),
  trendDegree: z.union([z.literal(0), z.literal(1), z.literal(2)]).optional(),
  trendEpoch: z.number().finite().optional(),
});

function validate(options: RvLikelihoodOptions): void {
  const parsed = optionsSchema.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = String(issue.path[0] ?? 'options');
    throw new OrbitParameterError(field, (options as unknown as Record<string, unknown>)[field], issue.message);
  }
  const { times, values, errors, instrument, instruments } = options;
  const n = times.length;
  for (const [field, a] of [['values', values], ['errors', errors], ['instrument', instrument]] as const) {
    if (a.length !== n) throw new RvDataError(`${field}.length`, undefined, a.length, `${n} (one per time)`);
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(times[i])) throw new RvDataError('times', i, times[i], 'a finite number (days)');
    if (!Number.isFinite(values[i])) throw new RvDataError('values', i, values[i], 'a finite number (m/s)');
    if (!(errors[i] > 0 && errors[i] < Infinity)) throw new RvDataError('errors', i, errors[i], 'a finite positive number (m/s)');
    if (!(instrument[i] >= 0 && instrument[i] < instruments)) {
      throw new RvDataError('instrument', i, instrument[i], `an index in 0..${instruments - 1}`);
    }
  }
}

/**
 * Builds the radial-velocity log-likelihood for a data set. Validates the data once
 * (zod for the shape; each bad point named by row and field) and preallocates every
 * per-point workspace, so evaluations allocate nothing.
 *
 * @throws RvDataError for malformed data, OrbitParameterError for bad options.
 */
export function createRvLikelihood(options: RvLikelihoodOptions): RvLikelihood {
  validate(options);
  const { times, values, errors, instrument, instruments, planets } = options;
  const form: EccentricityForm = options.eccentricityForm ?? 'polar';
  const degree = options.trendDegree ?? 0;
  const t0 = options.trendEpoch ?? 0;
  const N = times.length;
  const J = instruments;
  const offsetIndex = planets * PLANET_STRIDE;
  const jitterIndex = offsetIndex + J;
  const trendIndex = jitterIndex + J;
  const dim = trendIndex + degree;

  const names: string[] = [];
  for (let p = 0; p < planets; p++) names.push(...planetParameterNames(p, form));
  for (let j = 0; j < J; j++) names.push(`offset[${j}]`);
  for (let j = 0; j < J; j++) names.push(`jitter[${j}]`);
  if (degree >= 1) names.push('trendLinear');
  if (degree >= 2) names.push('trendQuadratic');

  const variance0 = new Float64Array(N);
  for (let i = 0; i < N; i++) variance0[i] = errors[i] * errors[i];
  const dtTrend = new Float64Array(N);
  for (let i = 0; i < N; i++) dtTrend[i] = times[i] - t0;
  const decoded = new Float64Array(Math.max(1, planets) * DECODED_STRIDE);
  const model = new Float64Array(N);
  const weights = new Float64Array(N);
  const sinF = new Float64Array(planets * N);
  const cosF = new Float64Array(planets * N);
  const jitter2 = new Float64Array(J);

  /** Pass 1: model mean into `model`; false when out of support. */
  function forward(params: Float64Array, keep: boolean): boolean {
    if (params.length < dim) throw new OrbitParameterError('params.length', params.length, `at least ${dim}`);
    if (!decodePlanets(params, planets, form, decoded)) return false;
    for (let j = 0; j < J; j++) {
      const off = params[offsetIndex + j];
      const jit = params[jitterIndex + j];
      if (!Number.isFinite(off) || !Number.isFinite(jit)) return false;
      jitter2[j] = jit * jit;
    }
    const c1 = degree >= 1 ? params[trendIndex] : 0;
    const c2 = degree >= 2 ? params[trendIndex + 1] : 0;
    if (!Number.isFinite(c1) || !Number.isFinite(c2)) return false;
    for (let i = 0; i < N; i++) {
      const d = dtTrend[i];
      model[i] = params[offsetIndex + instrument[i]] + d * (c1 + d * c2);
    }
    for (let p = 0; p < planets; p++) {
      addPlanetCurve(times, decoded, p * DECODED_STRIDE, model, keep ? sinF : null, keep ? cosF : null, p * N);
    }
    return true;
  }

  return {
    dim,
    names,
    offsetIndex,
    jitterIndex,
    trendIndex,
    lastModel: model,
    logLikelihood(params) {
      if (!forward(params, false)) return -Infinity;
      let sum = 0;
      for (let i = 0; i < N; i++) {
        const v = variance0[i] + jitter2[instrument[i]];
        const r = values[i] - model[i];
        sum += (r * r) / v + Math.log(v);
      }
      return -0.5 * (sum + N * LN_2PI);
    },
    logLikelihoodGrad(params, grad) {
      if (grad.length < dim) throw new OrbitParameterError('grad.length', grad.length, `at least ${dim}`);
      grad.fill(0, 0, dim);
      if (!forward(params, true)) return -Infinity;
      // Pass 2a: residuals, weights d log L / d mu_i, offset, jitter and trend sums.
      let sum = 0;
      let gc1 = 0;
      let gc2 = 0;
      for (let i = 0; i < N; i++) {
        const j = instrument[i];
        const v = variance0[i] + jitter2[j];
        const inv = 1 / v;
        const r = values[i] - model[i];
        const wr = r * inv;
        sum += r * wr + Math.log(v);
        weights[i] = wr;
        grad[offsetIndex + j] += wr;
        grad[jitterIndex + j] += wr * wr - inv;
        const d = dtTrend[i];
        gc1 += wr * d;
        gc2 += wr * d * d;
      }
      for (let j = 0; j < J; j++) grad[jitterIndex + j] *= params[jitterIndex + j];
      if (degree >= 1) grad[trendIndex] = gc1;
      if (degree >= 2) grad[trendIndex + 1] = gc2;
      // Pass 2b: planets, from the sin f / cos f kept in pass 1 (no Kepler solve).
      for (let p = 0; p < planets; p++) {
        planetVjpFromCache(times, decoded, p * DECODED_STRIDE, form, weights, sinF, cosF, p * N, grad, p * PLANET_STRIDE);
      }
      return -0.5 * (sum + N * LN_2PI);
    },
  };
}

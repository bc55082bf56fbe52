/**
 * Keplerian radial-velocity curve of one or more planets, summed, in float64, with its
 * exact vector-Jacobian product. Build a kernel once per data set (it owns its
 * workspace), then call it as often as the sampler needs: no allocation per call.
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
import { addPlanetCurve, planetVjpFromCache, planetVjpFused } from './rvPlanetLoops.js';

const kernelOptions = z.object({
  times: z.instanceof(Float64Array),
  planets: z.number().int().min(1),
  eccentricityForm: z.enum(['polar', 'root']).optional(),
});

/** Options of {@link createRvCurveKernel}. */
export interface RvCurveKernelOptions {
  /** Observation times, days relative to the caller's float64 reference epoch. */
  times: Float64Array;
  /** Number of planets (at least 1). */
  planets: number;
  /** How slots 2 and 3 of each planet are written; default 'polar' (e, omega). */
  eccentricityForm?: EccentricityForm;
}

/** A radial-velocity curve kernel bound to a set of times; see {@link createRvCurveKernel}. */
export interface RvCurveKernel {
  readonly times: Float64Array;
  readonly planets: number;
  readonly eccentricityForm: EccentricityForm;
  /** Length of a parameter vector: 5 per planet. */
  readonly parameterCount: number;
  /** Names of the parameter slots, e.g. `period[0]`, `tc[0]`, `eccentricity[0]`. */
  readonly parameterNames: readonly string[];
  /**
   * Writes the summed stellar velocity (m/s, positive = receding) at each time into
   * `out` (length >= times.length). Returns false, leaving `out` unspecified, if a
   * parameter is outside its support (P <= 0, e outside [0, 1), non-finite).
   */
  value(params: Float64Array, out: Float64Array): boolean;
  /**
   * Vector-Jacobian product: writes sum_i weights[i] d v_i / d params into `grad`
   * (length `parameterCount`), in one fused loop per planet. Returns false when
   * the parameters are outside their support (grad is then zero-filled).
   */
  vjp(params: Float64Array, weights: Float64Array, grad: Float64Array): boolean;
  /**
   * As {@link value}, and keeps sin f and cos f of every point so that a following
   * {@link vjpFromLastValue} with the same parameters needs no Kepler solve.
   */
  valueForGradient(params: Float64Array, out: Float64Array): boolean;
  /** Vector-Jacobian product at the parameters of the last {@link valueForGradient} call. */
  vjpFromLastValue(weights: Float64Array, grad: Float64Array): void;
}

/**
 * Builds a radial-velocity curve kernel for `times` (days) and `planets` planets.
 * Parameter vector per planet: [P (days), tc (days), e or h, omega or k, K (m/s)]
 * (see `planetParameters.ts`). The kernel checks lengths on each call but not
 * values beyond their support (cheap) and allocates nothing after construction.
 *
 * @throws RvDataError for a non-finite time (names the row);
 *   OrbitParameterError for bad options.
 */
export function createRvCurveKernel(options: RvCurveKernelOptions): RvCurveKernel {
  const parsed = kernelOptions.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = String(issue.path[0] ?? 'options');
    throw new OrbitParameterError(field, (options as unknown as Record<string, unknown>)[field], issue.message);
  }
  const { times, planets } = options;
  const form: EccentricityForm = options.eccentricityForm ?? 'polar';
  for (let i = 0; i < times.length; i++) {
    if (!Number.isFinite(times[i])) throw new RvDataError('times', i, times[i], 'a finite number (days)');
  }
  const N = times.length;
  const parameterCount = planets * PLANET_STRIDE;
  const decoded = new Float64Array(planets * DECODED_STRIDE);
  const cachedDecoded = new Float64Array(planets * DECODED_STRIDE);
  const sinF = new Float64Array(planets * N);
  const cosF = new Float64Array(planets * N);
  let cacheValid = false;
  const names: string[] = [];
  for (let p = 0; p < planets; p++) names.push(...planetParameterNames(p, form));

  const checkLength = (a: Float64Array, field: string, min: number): void => {
    if (a.length < min) throw new OrbitParameterError(`${field}.length`, a.length, `at least ${min}`);
  };

  return {
    times,
    planets,
    eccentricityForm: form,
    parameterCount,
    parameterNames: names,
    value(params, out) {
      checkLength(params, 'params', parameterCount);
      checkLength(out, 'out', N);
      if (!decodePlanets(params, planets, form, decoded)) return false;
      out.fill(0, 0, N);
      for (let p = 0; p < planets; p++) addPlanetCurve(times, decoded, p * DECODED_STRIDE, out, null, null, 0);
      return true;
    },
    vjp(params, weights, grad) {
      checkLength(params, 'params', parameterCount);
      checkLength(weights, 'weights', N);
      checkLength(grad, 'grad', parameterCount);
      if (!decodePlanets(params, planets, form, decoded)) {
        grad.fill(0, 0, parameterCount);
        return false;
      }
      for (let p = 0; p < planets; p++) {
        planetVjpFused(times, decoded, p * DECODED_STRIDE, form, weights, grad, p * PLANET_STRIDE, null);
      }
      return true;
    },
    valueForGradient(params, out) {
      checkLength(params, 'params', parameterCount);
      checkLength(out, 'out', N);
      cacheValid = false;
      if (!decodePlanets(params, planets, form, cachedDecoded)) return false;
      out.fill(0, 0, N);
      for (let p = 0; p < planets; p++) {
        addPlanetCurve(times, cachedDecoded, p * DECODED_STRIDE, out, sinF, cosF, p * N);
      }
      cacheValid = true;
      return true;
    },
    vjpFromLastValue(weights, grad) {
      checkLength(weights, 'weights', N);
      checkLength(grad, 'grad', parameterCount);
      if (!cacheValid) {
        throw new OrbitParameterError('vjpFromLastValue', 'no cached value', 'a successful valueForGradient call first');
      }
      for (let p = 0; p < planets; p++) {
        planetVjpFromCache(times, cachedDecoded, p * DECODED_STRIDE, form, weights, sinF, cosF, p * N, grad, p * PLANET_STRIDE);
      }
    },
  };
}

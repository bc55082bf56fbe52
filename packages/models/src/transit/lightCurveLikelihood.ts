/**
 * Gaussian log-likelihood of one light-curve data set (one instrument and band) under
 * the transit model, with its exact gradient, in float64.
 *
 * Model for point i (time t_i, observed flux y_i, error sigma_i):
 *   F_i   = light-curve kernel flux (relative, 1 out of transit; `lightCurve.ts`)
 *   m_i   = f0 (F_i + D) / (1 + D)          f0: mean out-of-transit flux (baseline),
 *                                           D: third light, flux of unresolved
 *                                           companions over the target's, D ≥ 0
 *   var_i = sigma_i² + s²                   s: jitter, enters as its square
 *   log L = -1/2 Σ_i [ (y_i - m_i)²/var_i + ln(2 pi var_i) ]
 * The dilution form: the companions add D to the target's F and the sum is
 * renormalised, so a transit depth δ is observed as δ/(1 + D).
 * Gradient: with g_i = (y_i - m_i)/var_i, ∂/∂F_i = g_i f0/(1 + D) (chained through the
 * kernel's kept Jacobian), ∂/∂f0 = Σ g_i (F_i + D)/(1 + D), ∂/∂s = s Σ (g_i² - 1/var_i),
 * ∂/∂D = Σ g_i f0 (1 - F_i)/(1 + D)².
 *
 * Parameter vector: the kernel's (7 per planet, u1, u2), then f0, s, and D if enabled.
 */
import { z } from 'zod';
import { LightCurveDataError, TransitWorkspaceError } from './errors.js';
import { createLightCurveKernel, type LightCurveKernel, type LightCurveOptions } from './lightCurve.js';

const LN_2PI = Math.log(2 * Math.PI);
/**
 * Points per call of the residual loops. Each call is short, so V8 compiles them as
 * ordinary functions instead of entering a long loop half-way through (on-stack
 * replacement): with one loop over all N points, some processes kept running that
 * loop's on-stack-replaced code at about 4 times the cost (Node 20; measured in 2–3 of
 * 10 fresh processes, none with --no-use-osr).
 */
const CHUNK = 1024;
/** Most points per logarithm when summing ln var_i (see {@link logBlockMask}). */
const MAX_LOG_BLOCK = 32;

/**
 * Σ ln var_i is accumulated as the sum of ln Π var_i over blocks of K consecutive
 * points (K a power of two, the block ending where (i & (K − 1)) = K − 1): one
 * logarithm per K points instead of one per point, and no less accurate. K is chosen
 * per call from the range of var_i, [vLo, vHi], so that a block's product stays a
 * normal float64: K · max(|log2 vLo|, |log2 vHi|) ≤ 1000 < 1022. Returns K − 1 (0, one
 * logarithm per point, for variances beyond 2^±1000 or non-finite ones).
 * (A per-point range test of a running product, tried first, cost the loop more than
 * the logarithms it saved: measured 6 against 3.5 ns per point.)
 */
function logBlockMask(vLo: number, vHi: number): number {
  const bound = Math.max(Math.abs(Math.log2(vLo)), Math.abs(Math.log2(vHi)));
  let k = 1;
  while (2 * k <= MAX_LOG_BLOCK && 2 * k * bound <= 1000) k *= 2;
  return k - 1;
}

/** Data and model shape for {@link createLightCurveLikelihood}. */
export interface LightCurveLikelihoodOptions extends LightCurveOptions {
  /** Observed flux at each time (any normalisation; the baseline parameter scales the model). */
  flux: Float64Array;
  /** One-sigma flux errors, positive, same units as `flux`. */
  errors: Float64Array;
  /** Fit a third-light dilution D ≥ 0. Default false (D = 0). */
  dilution?: boolean;
}

/** A ready light-curve log-likelihood over one float64 parameter vector. */
export interface LightCurveLikelihood {
  readonly dim: number;
  readonly names: readonly string[];
  /** The light-curve kernel inside (its parameters are the first `kernel.parameterCount` slots). */
  readonly kernel: LightCurveKernel;
  /** Slot of the baseline flux f0, of the jitter s and of the dilution D (-1 if not fitted). */
  readonly baselineIndex: number;
  readonly jitterIndex: number;
  readonly dilutionIndex: number;
  /** The model m_i of the last call, in the units of `flux`. */
  readonly lastModel: Float64Array;
  /** log L, or -Infinity when a parameter is outside its support. */
  logLikelihood(params: Float64Array): number;
  /** log L with its gradient written into `grad` (zero-filled when -Infinity is returned). */
  logLikelihoodGrad(params: Float64Array, grad: Float64Array): number;
}

const dataSchema = z.object({
  flux: z.instanceof(Float64Array),
  errors: z.instanceof(Float64Array),
  dilution: z.boolean().optional(),
});

/**
 * Builds the log-likelihood of one light-curve data set; buffers are allocated once.
 *
 * @throws LightCurveDataError for malformed data (names the row) or options.
 */
export function createLightCurveLikelihood(options: LightCurveLikelihoodOptions): LightCurveLikelihood {
  const parsed = dataSchema.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = String(issue.path[0] ?? 'options');
    throw new LightCurveDataError(field, undefined, (options as unknown as Record<string, unknown>)?.[field], issue.message);
  }
  const kernel = createLightCurveKernel(options);
  const N = kernel.times.length;
  const { flux: y, errors } = options;
  if (y.length !== N) throw new LightCurveDataError('flux.length', undefined, y.length, `${N} (one per time)`);
  if (errors.length !== N) throw new LightCurveDataError('errors.length', undefined, errors.length, `${N} (one per time)`);
  const variance0 = new Float64Array(N);
  let varianceMin = Infinity;
  let varianceMax = 0;
  for (let i = 0; i < N; i++) {
    if (!Number.isFinite(y[i])) throw new LightCurveDataError('flux', i, y[i], 'a finite number');
    if (!(errors[i] > 0 && errors[i] < Infinity)) throw new LightCurveDataError('errors', i, errors[i], 'a finite positive number');
    variance0[i] = errors[i] * errors[i];
    varianceMin = Math.min(varianceMin, variance0[i]);
    varianceMax = Math.max(varianceMax, variance0[i]);
  }
  const fitDilution = options.dilution ?? false;
  const kdim = kernel.parameterCount;
  const baselineIndex = kdim;
  const jitterIndex = kdim + 1;
  const dilutionIndex = fitDilution ? kdim + 2 : -1;
  const dim = kdim + (fitDilution ? 3 : 2);
  const names = Object.freeze([...kernel.names, 'baseline', 'jitter', ...(fitDilution ? ['dilution'] : [])]);
  const kparams = new Float64Array(kdim);
  const kgrad = new Float64Array(kdim);
  const weights = new Float64Array(N);
  const model = new Float64Array(N);
  const sums = new Float64Array(6);

  function checkLength(field: string, a: Float64Array): void {
    if (!(a instanceof Float64Array) || a.length !== dim) throw new TransitWorkspaceError(field, a, `a Float64Array of length ${dim}`);
  }

  /** Copies the kernel's slots and returns false when f0, s or D is outside its support. */
  function unpack(params: Float64Array): boolean {
    for (let j = 0; j < kdim; j++) kparams[j] = params[j];
    const f0 = params[baselineIndex];
    const s = params[jitterIndex];
    const D = fitDilution ? params[dilutionIndex] : 0;
    return f0 > 0 && f0 < Infinity && Number.isFinite(s) && D >= 0 && D < Infinity;
  }

  function evaluateLightCurve(params: Float64Array, grad: Float64Array | null): number {
    if (!unpack(params) || kernel.checkParameters(kparams) !== -1) {
      if (grad) grad.fill(0);
      return -Infinity;
    }
    const F = grad ? (kernel.fluxKeepingJacobian(kparams) as Float64Array) : kernel.flux(kparams);
    const f0 = params[baselineIndex];
    const s = params[jitterIndex];
    const s2 = s * s;
    const D = fitDilution ? params[dilutionIndex] : 0;
    const inv1D = 1 / (1 + D);
    const c = f0 * inv1D;
    const mask = logBlockMask(varianceMin + s2, varianceMax + s2);
    sums[0] = 0;
    sums[1] = 0;
    sums[2] = 1;
    sums[3] = 0;
    sums[4] = 0;
    sums[5] = 0;
    if (!grad) {
      for (let from = 0; from < N; from += CHUNK) valueChunk(F, from, Math.min(N, from + CHUNK), c, D, s2, mask);
      return -0.5 * (sums[0] + sums[1] + Math.log(sums[2]) + N * LN_2PI);
    }
    for (let from = 0; from < N; from += CHUNK) gradientChunk(F, from, Math.min(N, from + CHUNK), c, D, s2, mask);
    const chi2 = sums[0];
    const logVar = sums[1] + Math.log(sums[2]);
    kernel.vjpFromLast(weights, kgrad);
    for (let j = 0; j < kdim; j++) grad[j] = kgrad[j];
    grad[baselineIndex] = sums[3] * inv1D;
    grad[jitterIndex] = s * sums[5];
    if (fitDilution) grad[dilutionIndex] = sums[4] * f0 * inv1D * inv1D;
    return -0.5 * (chi2 + logVar + N * LN_2PI);
  }

  /**
   * Points [from, to) of the value-and-gradient pass, with g_i = (y_i − m_i)/var_i:
   * adds to sums = [χ², Σ ln var over finished blocks, the open block's product of
   * var_i, Σ g_i (F_i + D), Σ g_i (1 − F_i), Σ (g_i² − 1/var_i)] and writes the
   * weights g_i f0/(1 + D) for the kernel's kept Jacobian (file notes for the gradient).
   */
  function gradientChunk(F: Float64Array, from: number, to: number, c: number, D: number, s2: number, mask: number): void {
    let chi2 = sums[0];
    let logVar = sums[1];
    let product = sums[2];
    let gBase = sums[3];
    let gDil = sums[4];
    let gJit = sums[5];
    for (let i = from; i < to; i++) {
      const Fi = F[i];
      const m = c * (Fi + D);
      model[i] = m;
      const r = y[i] - m;
      const v = variance0[i] + s2;
      const iv = 1 / v;
      const g = r * iv;
      chi2 += r * g;
      product *= v;
      if ((i & mask) === mask) {
        logVar += Math.log(product);
        product = 1;
      }
      weights[i] = g * c;
      gBase += g * (Fi + D);
      gDil += g * (1 - Fi);
      gJit += g * g - iv;
    }
    sums[0] = chi2;
    sums[1] = logVar;
    sums[2] = product;
    sums[3] = gBase;
    sums[4] = gDil;
    sums[5] = gJit;
  }

  /** Points [from, to) of the value-only pass: χ² and Σ ln var into sums[0..2], same arithmetic. */
  function valueChunk(F: Float64Array, from: number, to: number, c: number, D: number, s2: number, mask: number): void {
    let chi2 = sums[0];
    let logVar = sums[1];
    let product = sums[2];
    for (let i = from; i < to; i++) {
      const m = c * (F[i] + D);
      model[i] = m;
      const r = y[i] - m;
      const v = variance0[i] + s2;
      chi2 += r * (r * (1 / v));
      product *= v;
      if ((i & mask) === mask) {
        logVar += Math.log(product);
        product = 1;
      }
    }
    sums[0] = chi2;
    sums[1] = logVar;
    sums[2] = product;
  }

  return {
    dim,
    names,
    kernel,
    baselineIndex,
    jitterIndex,
    dilutionIndex,
    lastModel: model,
    logLikelihood(params: Float64Array): number {
      checkLength('params', params);
      return evaluateLightCurve(params, null);
    },
    logLikelihoodGrad(params: Float64Array, grad: Float64Array): number {
      checkLength('params', params);
      checkLength('grad', grad);
      return evaluateLightCurve(params, grad);
    },
  };
}

import { createFftPlan, fftInPlace, nextPowerOfTwo, type FftPlan } from './fft.js';

/**
 * Autocovariance of chains by FFT (Wiener–Khinchin): zero-pad the centred series to a
 * power of two n ≥ 2N, transform, take the power spectrum, transform back. With n ≥ 2N no
 * circular wrap-around reaches any lag 0..N-1, so the result equals the direct sum
 *   acov(t) = (1/N) sum_{s=0}^{N-1-t} (x_s - mean)(x_{s+t} - mean)
 * (the biased, divisor-N estimator used by Geyer 1992 and Vehtari et al. 2021).
 *
 * Shorter padding: the circular sum at lag t only wraps products x_s x_{s+t-n} with
 * s + t ≥ n, which are all zero padding when t ≤ n - N. So a padding n ≥ N + L gives lags
 * 0..L exactly. When only the first L lags are needed (Geyer's sequence usually ends long
 * before N), the ESS code uses the power of two half the full size when it still leaves
 * L ≥ N/8 exact lags, and falls back to n ≥ 2N if the sequence has not ended by then.
 *
 * Two real series share one complex transform: z = x + i y. With Z = FFT(z),
 * X_k = (Z_k + conj Z_{n-k}) / 2 and Y_k = (Z_k - conj Z_{n-k}) / (2i); the spectrum
 * |X_k|^2 + i |Y_k|^2 transforms back to acov_x + i acov_y (both real). This halves the work.
 */

/** Reusable FFT buffers for one padded size. Create once, pass to many calls. */
export interface AutocovarianceWorkspace {
  readonly plan: FftPlan;
  readonly re: Float64Array;
  readonly im: Float64Array;
}

/**
 * Workspace for series of length `draws`: padding to the next power of two ≥ draws + lags
 * (default lags = draws, i.e. n ≥ 2N and every lag exact).
 */
export function createAutocovarianceWorkspace(draws: number, lags = draws): AutocovarianceWorkspace {
  const size = nextPowerOfTwo(Math.max(2, draws + lags));
  return { plan: createFftPlan(size), re: new Float64Array(size), im: new Float64Array(size) };
}

/** Mean; exactly the common value for a constant series (so it centres to exact zeros). */
function meanOf(x: ArrayLike<number>): number {
  let s = 0;
  let constant = true;
  const first = x[0];
  for (let i = 0; i < x.length; i++) {
    s += x[i];
    if (x[i] !== first) constant = false;
  }
  return constant ? first : s / x.length;
}

/**
 * Autocovariances of two series of equal length N in one complex FFT.
 * Writes the exact lags 0..L-1 into `outX` and `outY`, L = min(out length, N, n - N + 1)
 * for transform size n, and returns L. `y` may be null (then only `x` is transformed).
 * @param workspace buffers of size n ≥ N + 1 (see createAutocovarianceWorkspace)
 */
export function autocovariancePair(
  workspace: AutocovarianceWorkspace,
  x: ArrayLike<number>,
  y: ArrayLike<number> | null,
  outX: Float64Array,
  outY: Float64Array | null,
): number {
  const { plan, re, im } = workspace;
  const n = plan.size;
  const len = x.length;
  if (y !== null && y.length !== len) throw new RangeError(`y: expected length ${len}, got ${y.length}`);
  if (len >= n) throw new RangeError(`workspace: size ${n} is too small for series of length ${len} (needs > ${len})`);
  const mx = meanOf(x);
  for (let i = 0; i < len; i++) re[i] = x[i] - mx;
  re.fill(0, len);
  if (y !== null) {
    const my = meanOf(y);
    for (let i = 0; i < len; i++) im[i] = y[i] - my;
    im.fill(0, len);
  } else {
    im.fill(0);
  }
  fftInPlace(plan, re, im, false);
  // Split the joint spectrum into the two power spectra, pairing bins k and n - k.
  const half = n >> 1;
  for (let k = 0; k <= half; k++) {
    const j = k === 0 ? 0 : n - k;
    const ar = re[k];
    const ai = im[k];
    const br = re[j];
    const bi = im[j];
    const px = 0.25 * ((ar + br) * (ar + br) + (ai - bi) * (ai - bi));
    const py = 0.25 * ((ar - br) * (ar - br) + (ai + bi) * (ai + bi));
    re[k] = px;
    im[k] = py;
    re[j] = px;
    im[j] = py;
  }
  fftInPlace(plan, re, im, true);
  const exact = Math.min(len, n - len + 1);
  const lags = Math.min(outX.length, exact);
  const scale = 1 / len;
  for (let t = 0; t < lags; t++) outX[t] = re[t] * scale;
  if (outY !== null && y !== null) {
    const lagsY = Math.min(outY.length, exact);
    for (let t = 0; t < lagsY; t++) outY[t] = im[t] * scale;
    return Math.min(lags, lagsY);
  }
  return lags;
}

/**
 * Autocovariance of one series at lags 0..N-1 (divisor N), by FFT.
 * @param x draws of one chain (any units; the result is in squared units)
 */
export function autocovariance(x: ArrayLike<number>): Float64Array {
  const out = new Float64Array(x.length);
  if (x.length === 0) return out;
  autocovariancePair(createAutocovarianceWorkspace(x.length), x, null, out, null);
  return out;
}

/**
 * Autocovariance at lags 0..maxLag by direct summation (O(N maxLag)); the independent
 * check of the FFT route, and the fast route when only a few lags are needed.
 */
export function autocovarianceDirect(x: ArrayLike<number>, maxLag: number): Float64Array {
  const len = x.length;
  const lags = Math.min(maxLag + 1, len);
  const out = new Float64Array(lags);
  const m = meanOf(x);
  const c = new Float64Array(len);
  for (let i = 0; i < len; i++) c[i] = x[i] - m;
  for (let t = 0; t < lags; t++) {
    let s = 0;
    for (let i = 0; i + t < len; i++) s += c[i] * c[i + t];
    out[t] = s / len;
  }
  return out;
}

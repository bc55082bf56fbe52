import { autocovariancePair, createAutocovarianceWorkspace } from './autocovariance.js';
import { advanceGeyer, combinedCorrelation, correlationAt, essFromAutocovariances, finishGeyer, startGeyer, type CombinedCorrelation, type GeyerState } from './geyer.js';
import { splitHalves } from './splitChains.js';
import { fftOf, shortFftOf, type DiagnosticsWorkspace } from './workspace.js';

/**
 * Split-chain ESS of pooled series (chain-major, M chains of N draws), computed in two
 * routes that give the same autocovariances (tested to rounding error):
 * 1. direct lag sums, eight lags per pass over the data, while Geyer's sequence is still
 *    running and fewer than DIRECT_LAG_LIMIT lags have been used. Well-mixed chains end
 *    their positive-pair sequence within a few lags, so this is the usual, cheap route;
 * 2. otherwise the FFT, two series sharing each complex transform: first with the shorter
 *    padding that gives the first L ≥ N/16 lags exactly (see autocovariance.ts), then, only
 *    if Geyer's sequence is still running at lag L, with padding ≥ 2 (N/2) and every lag.
 * The direct route also hands over early when the correlation decays too slowly for it to
 * end within DIRECT_LAG_LIMIT lags (extrapolating rho_t geometrically from the last block).
 */

/** Lags computed per direct pass. */
export const DIRECT_LAG_BLOCK = 8;
/** Beyond this many lags the FFT route is cheaper (direct: about lags x S multiply-adds). */
export const DIRECT_LAG_LIMIT = 64;

function centreHalves(halves: readonly Float64Array[], centred: Float64Array, half: number): { views: Float64Array[]; means: Float64Array } {
  const means = new Float64Array(halves.length);
  const views: Float64Array[] = [];
  for (let j = 0; j < halves.length; j++) {
    const h = halves[j];
    let s = 0;
    let lo = h[0];
    let hi = h[0];
    for (let i = 0; i < half; i++) {
      const v = h[i];
      s += v;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    // A constant half is centred to exact zeros (its rounded mean may differ from its value).
    const m = lo === hi ? lo : s / half;
    const view = centred.subarray(j * half, (j + 1) * half);
    for (let i = 0; i < half; i++) view[i] = h[i] - m;
    means[j] = m;
    views.push(view);
  }
  return { views, means };
}

/** Direct divisor-n autocovariances of centred `c` at lags from..to-1 into `out`. */
function directLags(c: Float64Array, from: number, to: number, out: Float64Array): void {
  const n = c.length;
  const last = Math.min(to, n);
  if (last - from === DIRECT_LAG_BLOCK) {
    let s0 = 0, s1 = 0, s2 = 0, s3 = 0, s4 = 0, s5 = 0, s6 = 0, s7 = 0;
    const stop = n - (from + 7);
    let i = 0;
    for (; i < stop; i++) {
      const v = c[i];
      const k = i + from;
      s0 += v * c[k];
      s1 += v * c[k + 1];
      s2 += v * c[k + 2];
      s3 += v * c[k + 3];
      s4 += v * c[k + 4];
      s5 += v * c[k + 5];
      s6 += v * c[k + 6];
      s7 += v * c[k + 7];
    }
    const sums = [s0, s1, s2, s3, s4, s5, s6, s7];
    for (let j = 0; j < DIRECT_LAG_BLOCK; j++) {
      let s = sums[j];
      const t = from + j;
      for (let r = i; r + t < n; r++) s += c[r] * c[r + t];
      out[t] = s / n;
    }
    return;
  }
  for (let t = from; t < last; t++) {
    let s = 0;
    for (let i = 0; i + t < n; i++) s += c[i] * c[i + t];
    out[t] = s / n;
  }
}

/**
 * True when the combined autocorrelation at the last computed lag t decays so slowly that,
 * extrapolated as rho_t^(k/t), it would still exceed the noise level 2/sqrt(S) of the
 * estimates at lag DIRECT_LAG_LIMIT (so Geyer's sequence would not have ended there): then
 * the FFT is cheaper than more direct passes.
 */
function slowDecay(p: SeriesProgress, computed: number): boolean {
  const t = computed - 1;
  if (p.geyer.done || t < 1) return false;
  const rho = correlationAt(p.combined, p.acov, t);
  if (!(rho > 0)) return false;
  const noise = 2 / Math.sqrt(p.combined.chains * p.combined.draws);
  return Math.log(rho) * (DIRECT_LAG_LIMIT / t) > Math.log(noise);
}

interface SeriesProgress {
  readonly halves: Float64Array[];
  readonly centred: Float64Array[];
  readonly acov: Float64Array[];
  readonly combined: CombinedCorrelation;
  readonly geyer: GeyerState;
}

/**
 * Split-chain ESS of one or two pooled series.
 * @returns [ESS of a, ESS of b] (b's entry is NaN when b is null)
 */
export function splitEssPair(ws: DiagnosticsWorkspace, a: Float64Array, b: Float64Array | null): [number, number] {
  const half = ws.half;
  const inputs = b === null ? [a] : [a, b];
  const progress: SeriesProgress[] = inputs.map((series, s) => {
    const halves = splitHalves(series, ws.chains, ws.draws);
    const { views, means } = centreHalves(halves, s === 0 ? ws.centredA : ws.centredB, half);
    const acov = s === 0 ? ws.acovA : ws.acovB;
    const first = Math.min(DIRECT_LAG_BLOCK, half);
    for (let j = 0; j < views.length; j++) directLags(views[j], 0, first, acov[j]);
    const lagZero = acov.map((x) => x[0]);
    const combined = combinedCorrelation(views.length, half, means, lagZero);
    const geyer = startGeyer();
    if (combined.within > 0 && combined.plus > 0) advanceGeyer(geyer, combined, acov, first - 1);
    else geyer.done = true;
    return { halves, centred: views, acov, combined, geyer };
  });
  let computed = Math.min(DIRECT_LAG_BLOCK, half);
  const limit = Math.min(DIRECT_LAG_LIMIT, half);
  // Series still running that have been handed over to the FFT keep the lags they have.
  let direct = progress.filter((p) => !p.geyer.done);
  while (computed < limit) {
    direct = direct.filter((p) => !p.geyer.done && !slowDecay(p, computed));
    if (direct.length === 0) break;
    const to = Math.min(computed + DIRECT_LAG_BLOCK, half);
    for (const p of direct) {
      for (let j = 0; j < p.centred.length; j++) directLags(p.centred[j], computed, to, p.acov[j]);
      advanceGeyer(p.geyer, p.combined, p.acov, to - 1);
    }
    computed = to;
  }
  for (const fft of [shortFftOf(ws), fftOf(ws)]) {
    const pending = progress.filter((p) => !p.geyer.done);
    if (pending.length === 0 || fft === null) continue;
    const x = pending[0];
    const y = pending.length > 1 ? pending[1] : null;
    let exact = half;
    for (let j = 0; j < x.centred.length; j++) {
      exact = autocovariancePair(fft, x.centred[j], y === null ? null : y.centred[j], x.acov[j], y === null ? null : y.acov[j]);
    }
    for (const p of pending) advanceGeyer(p.geyer, p.combined, p.acov, exact - 1);
  }
  const ess = progress.map((p) => finishGeyer(p.geyer, p.combined).ess);
  return [ess[0], ess.length > 1 ? ess[1] : NaN];
}

function meansOf(chains: readonly Float64Array[]): Float64Array {
  const out = new Float64Array(chains.length);
  for (let j = 0; j < chains.length; j++) {
    const h = chains[j];
    let s = 0;
    for (let i = 0; i < h.length; i++) s += h[i];
    out[j] = s / h.length;
  }
  return out;
}

/**
 * ESS of whole (not split) chains of equal length, all lags by FFT. Used by
 * `essOfMean(chains, { split: false })` and as the exact counterpart of the running diagnostics.
 */
export function wholeChainEss(chains: readonly Float64Array[]): number {
  const draws = chains[0].length;
  const fft = createAutocovarianceWorkspace(draws);
  const acov = chains.map(() => new Float64Array(draws));
  for (let m = 0; m < chains.length; m += 2) {
    const second = m + 1 < chains.length ? chains[m + 1] : null;
    autocovariancePair(fft, chains[m], second, acov[m], second === null ? null : acov[m + 1]);
  }
  return essFromAutocovariances({ chains: chains.length, draws, means: meansOf(chains), acov }).ess;
}

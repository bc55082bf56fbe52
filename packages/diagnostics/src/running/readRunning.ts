import { autocovarianceDirect } from '../autocovariance.js';
import { advanceGeyer, combinedCorrelation, essFromAutocovariances, finishGeyer, startGeyer, varianceComponents } from '../geyer.js';
import { quantileOfSorted } from '../quantile.js';
import { bulkScores, foldedScores, loadQuantity } from '../quantitySteps.js';
import { combineRhat, rhatOfHalves } from '../rhatOfHalves.js';
import { splitHalves } from '../splitChains.js';
import type { DiagnosticWarning } from '../warningTypes.js';
import { createDiagnosticsWorkspace } from '../workspace.js';
import type { RunningDiagnosticsState } from './runningState.js';

/**
 * Reading the running diagnostics: R-hat and ESS approximations at any time, at a cost
 * bounded by the state's size (not by the number of draws received).
 *
 * - `ess` (ESS of the mean, whole chains, no rank normalisation): the exact autocovariances
 *   at lags 0..lagWindow from the running sums, combined across chains and summed with
 *   Geyer's initial monotone sequence exactly as `essOfMean(chains, { split: false })` does.
 *   Identical to it (up to rounding) whenever the sequence ends by lag lagWindow
 *   (`essMethod: 'autocorrelation'`). Otherwise (slow mixing, or chains that disagree, where
 *   the sequence runs past the window) a batch-means estimate is used
 *   (`essMethod: 'batch-means'`): the K batch means of size b of each chain form a coarse
 *   series; the same multi-chain combination and Geyer sequence give its autocorrelation
 *   time tau_b and variance var+_b, and tau = b var+_b tau_b / var+ (the variance of the
 *   grand mean, seen at both resolutions). With b much longer than the correlation time
 *   this is the classic batch-means estimator (Flegal & Jones 2010, Annals of Statistics 38,
 *   1034), with relative error about sqrt(2/(M K)); for chains that disagree it keeps the
 *   between-chain penalty of the full computation.
 * - `rhatBasic` (classic split R-hat of the draws): exact means and variances of the batch
 *   ladder; the split point falls on the batch boundary nearest N/2, so at most half a batch
 *   (≤ N/batches draws) sits in the wrong half.
 * - `rhat`, `rhatBulk`, `rhatFolded` (rank-normalised, as splitRhat): computed on the
 *   thinned reservoir (between reservoir/2 and reservoir draws per chain, evenly spaced
 *   over the whole history). An approximation whose noise is that of R-hat on that many
 *   draws.
 * - `median`, `q05`, `q95`: quantiles of the reservoir.
 * Tail-ESS and MCSE of quantiles need the full pass (`summarize`).
 */
export interface RunningQuantity {
  readonly name: string;
  /** Exact mean and sd (divisor S - 1) of every draw received. */
  readonly mean: number;
  readonly sd: number;
  readonly ess: number | null;
  readonly essMethod: 'autocorrelation' | 'batch-means' | null;
  readonly rhatBasic: number | null;
  readonly rhat: number | null;
  readonly rhatBulk: number | null;
  readonly rhatFolded: number | null;
  readonly median: number | null;
  readonly q05: number | null;
  readonly q95: number | null;
}

export interface RunningSnapshot {
  readonly chains: number;
  readonly drawsPerChain: number[];
  /** Reservoir draws used per chain for the rank-based values. */
  readonly reservoirDraws: number;
  readonly quantities: RunningQuantity[];
  readonly notices: DiagnosticWarning[];
}

function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

interface Moments {
  count: number;
  mean: number;
  m2: number;
}

function merge(a: Moments, b: Moments): Moments {
  if (a.count === 0) return b;
  if (b.count === 0) return a;
  const count = a.count + b.count;
  const d = b.mean - a.mean;
  return { count, mean: a.mean + (d * b.count) / count, m2: a.m2 + b.m2 + (d * d * a.count * b.count) / count };
}

/** Exact divisor-N autocovariances at lags 0..lags-1 of one (quantity, chain) slot. */
function slotAutocovariance(s: RunningDiagnosticsState, k: number, n: number, lags: number): Float64Array {
  const L = s.lagWindow;
  const out = new Float64Array(lags);
  const total = s.sum[k];
  const mean = total / n;
  let firstSum = 0;
  let lastSum = 0;
  for (let t = 0; t < lags; t++) {
    if (t > 0) {
      firstSum += s.head[k * L + t - 1];
      lastSum += s.ring[k * L + ((n - t) % L)];
    }
    const a = total - lastSum;
    const b = total - firstSum;
    out[t] = (s.lagSums[k * (L + 1) + t] - mean * (a + b) + (n - t) * mean * mean) / n;
  }
  return out;
}

function quantityEss(s: RunningDiagnosticsState, q: number, n: number): { ess: number; method: 'autocorrelation' | 'batch-means' } | null {
  const M = s.chains;
  const lags = Math.min(s.lagWindow + 1, n);
  const acov: Float64Array[] = [];
  const means = new Float64Array(M);
  const lagZero = new Float64Array(M);
  for (let c = 0; c < M; c++) {
    const k = q * M + c;
    const nc = s.count[c];
    acov.push(slotAutocovariance(s, k, nc, lags));
    means[c] = s.shift[k] + s.sum[k] / nc;
    lagZero[c] = acov[c][0];
  }
  const combined = combinedCorrelation(M, n, means, lagZero);
  if (!(combined.within > 0 && combined.plus > 0)) return null;
  const geyer = startGeyer();
  advanceGeyer(geyer, combined, acov, lags - 1);
  if (geyer.done) return { ess: finishGeyer(geyer, combined).ess, method: 'autocorrelation' };
  // Fallback: Geyer's sequence on the batch-means series of each chain (see module comment).
  let batches = Infinity;
  let size = 0;
  for (let c = 0; c < M; c++) {
    batches = Math.min(batches, s.closedBatches[c]);
    size += s.batchSize[c] / M;
  }
  if (batches < 8) return null;
  const coarse: Float64Array[] = [];
  const coarseMeans = new Float64Array(M);
  const coarseVariances = new Float64Array(M);
  for (let c = 0; c < M; c++) {
    const k = q * M + c;
    const series = new Float64Array(batches);
    for (let j = 0; j < batches; j++) series[j] = s.shift[k] + s.batchMean[k * s.batches + j];
    const acovC = autocovarianceDirect(series, batches - 1);
    coarse.push(acovC);
    let mean = 0;
    for (let j = 0; j < batches; j++) mean += series[j] / batches;
    coarseMeans[c] = mean;
    coarseVariances[c] = (acovC[0] * batches) / (batches - 1);
  }
  const coarseEss = essFromAutocovariances({ chains: M, draws: batches, means: coarseMeans, acov: coarse }).ess;
  const coarsePlus = varianceComponents(M, batches, coarseMeans, coarseVariances).plus;
  if (!(coarseEss > 0) || !(coarsePlus > 0)) return null;
  const tauCoarse = (M * batches) / coarseEss;
  const tau = Math.max((size * coarsePlus * tauCoarse) / combined.plus, 1 / Math.log10(M * n));
  return { ess: (M * n) / tau, method: 'batch-means' };
}

function quantityRhatBasic(s: RunningDiagnosticsState, q: number): number {
  const M = s.chains;
  const B = s.batches;
  const halves: Moments[] = [];
  for (let c = 0; c < M; c++) {
    const k = q * M + c;
    const b = s.batchSize[c];
    const closed = s.closedBatches[c];
    const open = s.openCount[c];
    const n = s.count[c];
    let split = Math.round(n / 2 / b);
    split = Math.max(1, Math.min(split, open > 0 ? closed : closed - 1));
    let first: Moments = { count: 0, mean: 0, m2: 0 };
    let second: Moments = { count: 0, mean: 0, m2: 0 };
    for (let j = 0; j < closed; j++) {
      const batch = { count: b, mean: s.batchMean[k * B + j], m2: s.batchM2[k * B + j] };
      if (j < split) first = merge(first, batch);
      else second = merge(second, batch);
    }
    second = merge(second, { count: open, mean: s.openMean[k], m2: s.openM2[k] });
    halves.push({ ...first, mean: first.mean + s.shift[k] }, { ...second, mean: second.mean + s.shift[k] });
  }
  const nBar = halves.reduce((a, h) => a + h.count, 0) / halves.length;
  let w = 0;
  let grand = 0;
  for (const h of halves) {
    w += h.m2 / (h.count - 1);
    grand += h.mean;
  }
  w /= halves.length;
  grand /= halves.length;
  let between = 0;
  for (const h of halves) between += (h.mean - grand) ** 2;
  between /= halves.length - 1;
  const plus = ((nBar - 1) / nBar) * w + between;
  if (w > 0) return Math.sqrt(plus / w);
  return plus > 0 ? Infinity : NaN;
}

/**
 * Current approximations of R-hat and ESS for every quantity (see the module comment).
 * Values are null until each chain has at least 8 draws, or when undefined (constant).
 */
export function readRunningDiagnostics(s: RunningDiagnosticsState): RunningSnapshot {
  const M = s.chains;
  const counts = Array.from(s.count);
  const n = Math.min(...counts);
  const notices: DiagnosticWarning[] = [];
  if (counts.some((c) => c !== n)) {
    notices.push({
      code: 'chains-truncated',
      severity: 'caution',
      quantity: null,
      chain: null,
      value: n,
      threshold: null,
      message: `The chains have received different numbers of draws (${counts.join(', ')}); the running values treat them as if of length ${n} where a common length is needed, so they are rougher than usual.`,
      advice: 'Read the running diagnostics when every chain has reported, or feed the chains in step.',
    });
  }
  const resN = Math.min(...Array.from(s.reservoirCount));
  const ready = n >= 8;
  const ws = ready && resN >= 8 ? createDiagnosticsWorkspace(M, resN) : null;
  const quantities: RunningQuantity[] = s.names.map((name, q) => {
    let sum = 0;
    let total = 0;
    let m2: Moments = { count: 0, mean: 0, m2: 0 };
    for (let c = 0; c < M; c++) {
      const k = q * M + c;
      // whole-chain moments from the batch ladder (exact)
      let chain: Moments = { count: 0, mean: 0, m2: 0 };
      for (let j = 0; j < s.closedBatches[c]; j++) chain = merge(chain, { count: s.batchSize[c], mean: s.batchMean[k * s.batches + j], m2: s.batchM2[k * s.batches + j] });
      chain = merge(chain, { count: s.openCount[c], mean: s.openMean[k], m2: s.openM2[k] });
      m2 = merge(m2, { ...chain, mean: chain.mean + s.shift[k] });
      sum += s.sum[k] + s.count[c] * s.shift[k];
      total += s.count[c];
    }
    const mean = total > 0 ? sum / total : NaN;
    const sd = m2.count > 1 ? Math.sqrt(m2.m2 / (m2.count - 1)) : NaN;
    const empty: RunningQuantity = { name, mean, sd, ess: null, essMethod: null, rhatBasic: null, rhat: null, rhatBulk: null, rhatFolded: null, median: null, q05: null, q95: null };
    if (!ready) return empty;
    const ess = quantityEss(s, q, n);
    let rank = { rhat: NaN, bulk: NaN, folded: NaN, median: NaN, q05: NaN, q95: NaN };
    if (ws !== null) {
      const chains = Array.from({ length: M }, (_, c) => s.reservoirDraws.subarray((q * M + c) * s.reservoir, (q * M + c) * s.reservoir + resN));
      const loaded = loadQuantity(ws, chains);
      const q05 = quantileOfSorted(ws.sorted, 0.05);
      const q95 = quantileOfSorted(ws.sorted, 0.95);
      if (!loaded.constant) {
        const bulk = rhatOfHalves(splitHalves(bulkScores(ws), M, resN));
        const folded = rhatOfHalves(splitHalves(foldedScores(ws, loaded.median), M, resN));
        rank = { rhat: combineRhat(bulk, folded), bulk, folded, median: loaded.median, q05, q95 };
      } else rank = { ...rank, median: loaded.median, q05, q95 };
    }
    return {
      ...empty,
      ess: ess === null ? null : finite(ess.ess),
      essMethod: ess === null ? null : ess.method,
      rhatBasic: finite(quantityRhatBasic(s, q)),
      rhat: finite(rank.rhat),
      rhatBulk: finite(rank.bulk),
      rhatFolded: finite(rank.folded),
      median: finite(rank.median),
      q05: finite(rank.q05),
      q95: finite(rank.q95),
    };
  });
  return { chains: M, drawsPerChain: counts, reservoirDraws: resN, quantities, notices };
}

import { foldedOrderFromOrder, rankNormalizeFromOrder } from './ranks.js';
import { quantileOfSorted } from './quantile.js';
import { radixArgsort } from './radixArgsort.js';
import { poolChains } from './splitChains.js';
import { scoreTableOf, type DiagnosticsWorkspace } from './workspace.js';

/**
 * The shared steps of every diagnostic of one quantity, over a workspace: pool and sort
 * once (radix argsort), then derive the rank-normalised, folded and indicator series from
 * that one sort.
 */

/** Pooled moments of the loaded quantity. */
export interface LoadedQuantity {
  readonly mean: number;
  /** Standard deviation over all pooled draws (divisor S - 1). */
  readonly sd: number;
  readonly median: number;
  /** True when every draw has the same value. */
  readonly constant: boolean;
}

/** Pools `chains` into ws.pooled, and sorts: ws.order, ws.sorted. */
export function loadQuantity(ws: DiagnosticsWorkspace, chains: readonly Float64Array[]): LoadedQuantity {
  const pooled = poolChains(chains, ws.pooled);
  const total = ws.total;
  let s = 0;
  for (let i = 0; i < total; i++) s += pooled[i];
  const mean = s / total;
  let ss = 0;
  for (let i = 0; i < total; i++) ss += (pooled[i] - mean) * (pooled[i] - mean);
  radixArgsort(pooled, ws.order, ws.sorted, ws.sortBuffers);
  const median = quantileOfSorted(ws.sorted, 0.5);
  const constant = ws.sorted[0] === ws.sorted[total - 1];
  if (constant) return { mean: ws.sorted[0], sd: 0, median, constant };
  return { mean, sd: Math.sqrt(ss / (total - 1)), median, constant };
}

/** Rank-normalised draws into ws.bulkScores. */
export function bulkScores(ws: DiagnosticsWorkspace): Float64Array {
  return rankNormalizeFromOrder(ws.order, ws.sorted, scoreTableOf(ws), ws.bulkScores);
}

/** Rank-normalised folded draws |x - median| into ws.foldedScores. */
export function foldedScores(ws: DiagnosticsWorkspace, median: number): Float64Array {
  foldedOrderFromOrder(ws.order, ws.sorted, median, ws.foldedOrder, ws.foldedSorted);
  return rankNormalizeFromOrder(ws.foldedOrder, ws.foldedSorted, scoreTableOf(ws), ws.foldedScores);
}

/** Indicator I(x ≤ threshold) of the pooled draws, written into `out`. */
export function indicator(ws: DiagnosticsWorkspace, threshold: number, out: Float64Array): Float64Array {
  const pooled = ws.pooled;
  for (let i = 0; i < ws.total; i++) out[i] = pooled[i] <= threshold ? 1 : 0;
  return out;
}

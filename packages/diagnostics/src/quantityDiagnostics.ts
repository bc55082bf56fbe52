import { quantileOfSorted } from './quantile.js';
import { bulkScores, foldedScores, indicator, loadQuantity } from './quantitySteps.js';
import { combineRhat, rhatOfHalves } from './rhatOfHalves.js';
import { splitEssPair } from './seriesEss.js';
import { splitHalves } from './splitChains.js';
import type { DiagnosticsWorkspace } from './workspace.js';
import { TAIL_PROBABILITIES } from './ess.js';

/**
 * Every per-quantity diagnostic in one pass over a workspace: one sort, two rank
 * transforms, and two shared ESS computations (bulk with the raw draws, the two tail
 * indicators together). Undefined values are NaN here; summaries turn them into null.
 */
export interface QuantityDiagnostics {
  readonly mean: number;
  readonly sd: number;
  readonly median: number;
  /** Values at the requested probabilities, same order. */
  readonly quantiles: number[];
  readonly rhat: number;
  readonly rhatBulk: number;
  readonly rhatFolded: number;
  readonly bulkEss: number;
  readonly tailEss: number;
  /** Classic (non-rank) ESS of the mean, split chains. */
  readonly essMean: number;
  /** sd / sqrt(essMean); 0 for a constant quantity. */
  readonly mcseMean: number;
  readonly constant: boolean;
}

export function diagnoseQuantity(ws: DiagnosticsWorkspace, chains: readonly Float64Array[], probabilities: readonly number[]): QuantityDiagnostics {
  const loaded = loadQuantity(ws, chains);
  const quantiles = probabilities.map((p) => quantileOfSorted(ws.sorted, p));
  const base = { mean: loaded.mean, sd: loaded.sd, median: loaded.median, quantiles };
  if (loaded.constant) {
    return { ...base, rhat: NaN, rhatBulk: NaN, rhatFolded: NaN, bulkEss: NaN, tailEss: NaN, essMean: NaN, mcseMean: 0, constant: true };
  }
  const bulk = bulkScores(ws);
  const rhatBulk = rhatOfHalves(splitHalves(bulk, ws.chains, ws.draws));
  const rhatFolded = rhatOfHalves(splitHalves(foldedScores(ws, loaded.median), ws.chains, ws.draws));
  const [bulkEss, essMean] = splitEssPair(ws, bulk, ws.pooled);
  const low = indicator(ws, quantileOfSorted(ws.sorted, TAIL_PROBABILITIES[0]), ws.low);
  const high = indicator(ws, quantileOfSorted(ws.sorted, TAIL_PROBABILITIES[1]), ws.high);
  const [lowEss, highEss] = splitEssPair(ws, low, high);
  return {
    ...base,
    rhat: combineRhat(rhatBulk, rhatFolded),
    rhatBulk,
    rhatFolded,
    bulkEss,
    tailEss: Math.min(lowEss, highEss),
    essMean,
    mcseMean: loaded.sd / Math.sqrt(essMean),
    constant: false,
  };
}

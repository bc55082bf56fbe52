import { OptionError } from './errors.js';
import { prepareQuantity } from './prepare.js';
import { quantileOfSorted } from './quantile.js';
import { bulkScores, indicator } from './quantitySteps.js';
import { splitEssPair, wholeChainEss } from './seriesEss.js';
import type { ChainsInput } from './validateChains.js';

/**
 * Effective sample sizes (Vehtari et al. 2021, Bayesian Analysis 16, 667):
 * all on split chains, autocorrelations by FFT, Geyer's (1992) initial monotone sequence.
 * Units: number of draws. NaN when every draw is identical.
 */

/** Tail probabilities used by tail-ESS (Vehtari et al. 2021: the 5% and 95% quantiles). */
export const TAIL_PROBABILITIES = [0.05, 0.95] as const;

function checkProbability(p: unknown, field: string): number {
  if (typeof p !== 'number' || !(p > 0 && p < 1)) {
    throw new OptionError(field, `${field}: expected a probability strictly between 0 and 1, got ${String(p)}`);
  }
  return p;
}

/**
 * Bulk effective sample size: ESS of the rank-normalised split chains. Measures how well
 * the centre of the distribution is resolved; well defined even without finite moments.
 * @param chains one array (or typed array) of draws per chain, one scalar quantity
 */
export function bulkEss(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  return splitEssPair(ws, bulkScores(ws), null)[0];
}

/**
 * Tail effective sample size: the smaller ESS of the indicators I(x ≤ q05) and I(x ≤ q95),
 * q05 and q95 the pooled 5% and 95% quantiles. Measures how well the tails are resolved.
 */
export function tailEss(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  const low = indicator(ws, quantileOfSorted(ws.sorted, TAIL_PROBABILITIES[0]), ws.low);
  const high = indicator(ws, quantileOfSorted(ws.sorted, TAIL_PROBABILITIES[1]), ws.high);
  const [a, b] = splitEssPair(ws, low, high);
  return Math.min(a, b);
}

/**
 * ESS of the quantile at probability p: ESS of the indicator I(x ≤ q_p) on split chains.
 * @param probability in (0, 1)
 */
export function essOfQuantile(chains: ChainsInput, probability: number): number {
  const p = checkProbability(probability, 'probability');
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  return splitEssPair(ws, indicator(ws, quantileOfSorted(ws.sorted, p), ws.low), null)[0];
}

/** Options of essOfMean. */
export interface EssOfMeanOptions {
  /** Split each chain in halves first (default true, as Vehtari et al. 2021 recommend). */
  split?: boolean;
}

/**
 * ESS of the mean: the classic ESS of the draws themselves, without rank normalisation.
 * Meaningful only when the quantity has a finite variance (compare bulkEss).
 */
export function essOfMean(chains: ChainsInput, options: EssOfMeanOptions = {}): number {
  const { prepared, ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  if (options.split === false) return wholeChainEss(prepared.chains);
  return splitEssPair(ws, ws.pooled, null)[0];
}

/**
 * ESS of the standard deviation: ESS of the squared centred draws (x - mean)^2 on split
 * chains (the second-moment series whose mean is the variance).
 */
export function essOfSd(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  const squares = ws.low;
  for (let i = 0; i < ws.total; i++) squares[i] = (ws.pooled[i] - loaded.mean) ** 2;
  return splitEssPair(ws, squares, null)[0];
}

import { prepareQuantity } from './prepare.js';
import { bulkScores, foldedScores } from './quantitySteps.js';
import { combineRhat, rhatOfHalves } from './rhatOfHalves.js';
import { splitHalves } from './splitChains.js';
import type { ChainsInput } from './validateChains.js';

/**
 * Rank-normalised split R-hat (Vehtari et al. 2021, Bayesian Analysis 16, 667):
 * the larger of the bulk R-hat (split R-hat of the rank-normalised draws) and the folded
 * R-hat (the same of the rank-normalised |x - median|). Dimensionless; 1 when the chains
 * agree. Chains of unequal length are truncated to the shortest.
 * @param chains one array (or typed array) of draws per chain, one scalar quantity
 * @returns NaN when every draw is identical (R-hat undefined), +Infinity when the chains are
 *   each constant at different values
 * @throws ChainShapeError, NonFiniteDrawError, TooFewDrawsError (fewer than 8 draws per chain)
 */
export function splitRhat(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  const bulk = rhatOfHalves(splitHalves(bulkScores(ws), ws.chains, ws.draws));
  const folded = rhatOfHalves(splitHalves(foldedScores(ws, loaded.median), ws.chains, ws.draws));
  return combineRhat(bulk, folded);
}

/** Bulk R-hat: split R-hat of the rank-normalised draws (detects differences in location). */
export function splitRhatBulk(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  return rhatOfHalves(splitHalves(bulkScores(ws), ws.chains, ws.draws));
}

/** Folded R-hat: split R-hat of the rank-normalised |x - median| (detects differences in scale). */
export function splitRhatFolded(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  return rhatOfHalves(splitHalves(foldedScores(ws, loaded.median), ws.chains, ws.draws));
}

/**
 * Classic split R-hat of the draws themselves, without rank normalisation (Gelman et al.,
 * Bayesian Data Analysis, 3rd ed., sec. 11.4). Unreliable for heavy tails; kept for
 * comparison and for the running diagnostics.
 */
export function splitRhatBasic(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return NaN;
  return rhatOfHalves(splitHalves(ws.pooled, ws.chains, ws.draws));
}

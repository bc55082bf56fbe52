import { betaQuantile } from './beta.js';
import { OptionError } from './errors.js';
import { prepareQuantity } from './prepare.js';
import { quantileOfSorted } from './quantile.js';
import { indicator } from './quantitySteps.js';
import { splitEssPair } from './seriesEss.js';
import type { ChainsInput } from './validateChains.js';

/**
 * Monte Carlo standard errors: the standard deviation of the estimation error of a
 * posterior summary due to finite, autocorrelated draws. Same units as the draws.
 */

/** Phi(-1) and Phi(1): the probabilities one standard deviation either side of the centre (from memory; checked in the tests by integrating the normal density). */
export const ONE_SIGMA_LOW = 0.15865525393145707;
export const ONE_SIGMA_HIGH = 0.8413447460685429;

/**
 * MCSE of the mean: sd / sqrt(ESS of the mean) (classic; needs a finite variance).
 * @returns 0 for a constant quantity
 */
export function mcseOfMean(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return 0;
  const ess = splitEssPair(ws, ws.pooled, null)[0];
  return loaded.sd / Math.sqrt(ess);
}

/**
 * MCSE of the standard deviation, by the delta method: with y = (x - mean)^2,
 * MCSE(var) = sd(y) / sqrt(ESS of y) and MCSE(sd) = MCSE(var) / (2 sd). Needs finite fourth moments.
 */
export function mcseOfSd(chains: ChainsInput): number {
  const { ws, loaded } = prepareQuantity(chains);
  if (loaded.constant) return 0;
  const y = ws.low;
  let s = 0;
  for (let i = 0; i < ws.total; i++) {
    y[i] = (ws.pooled[i] - loaded.mean) ** 2;
    s += y[i];
  }
  const my = s / ws.total;
  let ss = 0;
  for (let i = 0; i < ws.total; i++) ss += (y[i] - my) ** 2;
  const sdY = Math.sqrt(ss / (ws.total - 1));
  const ess = splitEssPair(ws, y, null)[0];
  return sdY / Math.sqrt(ess) / (2 * loaded.sd);
}

/** MCSE of a quantile, with the interval it comes from. */
export interface QuantileMcse {
  /** Probability level p. */
  readonly probability: number;
  /** Estimated quantile q_p (units of the draws). */
  readonly value: number;
  /** Monte Carlo standard error of q_p: half the width of [lower, upper]. */
  readonly mcse: number;
  /** Draw quantiles at the Beta(S_eff p + 1, S_eff (1 - p) + 1) quantiles Phi(-1), Phi(1). */
  readonly lower: number;
  readonly upper: number;
  /** ESS of the indicator I(x ≤ q_p). */
  readonly ess: number;
}

/**
 * MCSE of the quantile at probability p (the quantile MCSE of Vehtari et al. 2021): with S_eff the ESS
 * of I(x ≤ q_p), take the Phi(-1) and Phi(1) quantiles a < b of
 * Beta(S_eff p + 1, S_eff (1 - p) + 1); the MCSE is half the distance between the draw
 * quantiles at a and b. Needs no moments, so it works for heavy tails.
 */
export function mcseOfQuantileDetailed(chains: ChainsInput, probability: number): QuantileMcse {
  if (typeof probability !== 'number' || !(probability > 0 && probability < 1)) {
    throw new OptionError('probability', `probability: expected a probability strictly between 0 and 1, got ${String(probability)}`);
  }
  const { ws, loaded } = prepareQuantity(chains);
  const value = quantileOfSorted(ws.sorted, probability);
  if (loaded.constant) return { probability, value, mcse: 0, lower: value, upper: value, ess: NaN };
  const ess = splitEssPair(ws, indicator(ws, value, ws.low), null)[0];
  const a = ess * probability + 1;
  const b = ess * (1 - probability) + 1;
  const lower = quantileOfSorted(ws.sorted, betaQuantile(ONE_SIGMA_LOW, a, b));
  const upper = quantileOfSorted(ws.sorted, betaQuantile(ONE_SIGMA_HIGH, a, b));
  return { probability, value, mcse: (upper - lower) / 2, lower, upper, ess };
}

/** MCSE of the quantile at probability p (see mcseOfQuantileDetailed). */
export function mcseOfQuantile(chains: ChainsInput, probability: number): number {
  return mcseOfQuantileDetailed(chains, probability).mcse;
}

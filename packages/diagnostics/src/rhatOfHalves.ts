import { varianceComponents } from './geyer.js';

/**
 * Potential scale reduction of a set of (split) chains, Gelman & Rubin (1992, Statistical
 * Science 7, 457) in the form of Vehtari et al. (2021):
 * R-hat = sqrt(var+ / W), var+ = (n-1)/n W + B/n.
 * Returns NaN when every draw is the same (undefined), +Infinity when each half is constant
 * but the halves differ (the chains are stuck at different values).
 */
export function rhatOfHalves(halves: readonly ArrayLike<number>[]): number {
  const count = halves.length;
  const n = halves[0].length;
  const means = new Float64Array(count);
  const variances = new Float64Array(count);
  for (let j = 0; j < count; j++) {
    const h = halves[j];
    let s = 0;
    let lo = h[0];
    let hi = h[0];
    for (let i = 0; i < n; i++) {
      const v = h[i];
      s += v;
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    // A constant half has variance exactly 0 (its rounded mean may differ from its value).
    const m = lo === hi ? lo : s / n;
    let ss = 0;
    if (lo !== hi) for (let i = 0; i < n; i++) ss += (h[i] - m) * (h[i] - m);
    means[j] = m;
    variances[j] = ss / (n - 1);
  }
  const { within, plus } = varianceComponents(count, n, means, variances);
  if (within > 0) return Math.sqrt(plus / within);
  return plus > 0 ? Infinity : NaN;
}

/**
 * The reported R-hat: the larger of bulk and folded; +Infinity if either is infinite (a
 * folded series can be constant when the bulk one is not), NaN only if undefined otherwise.
 */
export function combineRhat(bulk: number, folded: number): number {
  if (bulk === Infinity || folded === Infinity) return Infinity;
  return Math.max(bulk, folded);
}

/**
 * Ranks of draws pooled over all chains, as used by rank plots and rank
 * normalisation (Vehtari et al. 2021, Bayesian Analysis 16, 667, sec. 4).
 */

/** Number of entries of increasing `sorted` below v (strict) or at most v. */
function countBelow(sorted: Float64Array, v: number, inclusive: boolean): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < v || (inclusive && sorted[mid] === v)) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Rank of every draw among all chains' draws together, from 1 to N; tied values
 * share the average of their ranks. Returned per chain, same shape as the input.
 * A draw with L values strictly below it and U values at or below it has
 * average rank (L + 1 + U) / 2.
 */
export function pooledRanks(chains: readonly ArrayLike<number>[]): Float64Array[] {
  let n = 0;
  for (const c of chains) n += c.length;
  const sorted = new Float64Array(n);
  let at = 0;
  for (const c of chains) {
    for (let i = 0; i < c.length; i++) sorted[at++] = c[i];
  }
  sorted.sort();
  return chains.map((c) => {
    const r = new Float64Array(c.length);
    for (let i = 0; i < c.length; i++) {
      const v = c[i];
      r[i] = (countBelow(sorted, v, false) + 1 + countBelow(sorted, v, true)) / 2;
    }
    return r;
  });
}

/**
 * Counts of ranks (1..total) in `bins` equal bins. Bin b holds ranks r with
 * floor((r − 1) · bins / total) = b.
 */
export function rankCounts(ranks: ArrayLike<number>, total: number, bins: number): Float64Array {
  const counts = new Float64Array(bins);
  for (let i = 0; i < ranks.length; i++) {
    const b = Math.min(bins - 1, Math.max(0, Math.floor(((ranks[i] - 1) * bins) / total)));
    counts[b]++;
  }
  return counts;
}

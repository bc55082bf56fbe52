import { normalQuantile } from './normalQuantile.js';

/**
 * Ranks and rank normalisation (Vehtari et al. 2021, Bayesian Analysis 16, 667):
 * pool all draws, replace each by its average rank r (ties share the mean of their ranks),
 * then by the normal score z = Phi^{-1}((r - 3/8) / (S + 1/4)) (Blom 1958), S = number of
 * pooled draws. Ranks are found by binary search in one sorted copy, so a quantity is sorted
 * once however many rank transforms it needs; the folded draws |x - median| are sorted by
 * merging the two monotone halves of that same sorted copy.
 */

/** Index of the first element ≥ v in ascending `sorted` (its length if none). */
export function lowerBound(sorted: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Index of the first element > v in ascending `sorted` (its length if none). */
export function upperBound(sorted: ArrayLike<number>, v: number): number {
  let lo = 0;
  let hi = sorted.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (sorted[mid] <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** Ascending sorted copy. */
export function sortedCopy(values: ArrayLike<number>): Float64Array {
  return Float64Array.from(values).sort();
}

/** Average ranks (1-based; ties get the mean of their ranks) of `values` among `sorted`. */
export function averageRanks(values: ArrayLike<number>, sorted: ArrayLike<number> = sortedCopy(values)): Float64Array {
  const out = new Float64Array(values.length);
  const n = sorted.length;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const lo = lowerBound(sorted, v);
    let hi = lo + 1;
    if (hi < n && sorted[hi] === v) hi = upperBound(sorted, v);
    out[i] = (lo + 1 + hi) / 2;
  }
  return out;
}

/**
 * Normal scores of the integer ranks 1..S: table[i] = Phi^{-1}((i + 1 - 3/8) / (S + 1/4)).
 * Shared by every quantity with the same number of draws.
 */
export function normalScoreTable(total: number): Float64Array {
  const table = new Float64Array(total);
  const denominator = total + 0.25;
  for (let i = 0; i < total; i++) table[i] = normalQuantile((i + 1 - 0.375) / denominator);
  return table;
}

/**
 * Rank-normalised values: z_i = Phi^{-1}((r_i - 3/8)/(S + 1/4)) with r_i the average rank
 * of values[i] among `sorted` (S = sorted.length). Writes into `out`.
 * @param table normal scores of integer ranks for this S (see normalScoreTable)
 */
export function rankNormalize(values: ArrayLike<number>, sorted: ArrayLike<number>, table: ArrayLike<number>, out: Float64Array): Float64Array {
  const n = sorted.length;
  const denominator = n + 0.25;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    const lo = lowerBound(sorted, v);
    if (lo + 1 >= n || sorted[lo + 1] !== v) {
      out[i] = table[lo];
    } else {
      const hi = upperBound(sorted, v);
      out[i] = normalQuantile(((lo + 1 + hi) / 2 - 0.375) / denominator);
    }
  }
  return out;
}

/**
 * Sorted folded draws |x - median| from the sorted draws, by merging the descending
 * distances below the median with the ascending distances above it (no second sort).
 */
export function sortedFolded(sorted: ArrayLike<number>, median: number, out: Float64Array): Float64Array {
  const n = sorted.length;
  const split = lowerBound(sorted, median);
  let below = split - 1; // walks down: median - sorted[below] ascending
  let above = split; // walks up: sorted[above] - median ascending
  for (let k = 0; k < n; k++) {
    const a = below >= 0 ? median - sorted[below] : Infinity;
    const b = above < n ? sorted[above] - median : Infinity;
    if (a <= b) {
      out[k] = a;
      below--;
    } else {
      out[k] = b;
      above++;
    }
  }
  return out;
}

/** Folded draws |x - median|, written into `out`. */
export function foldDraws(values: ArrayLike<number>, median: number, out: Float64Array): Float64Array {
  for (let i = 0; i < values.length; i++) out[i] = Math.abs(values[i] - median);
  return out;
}

/**
 * Rank-normalised values from a sorting permutation: walks the sorted draws once, gives each
 * run of ties its average rank, and scatters the normal scores back to the draws' positions.
 * Same result as rankNormalize, in O(S) after the sort.
 * @param order ascending permutation (values[order[i]] = sorted[i])
 */
export function rankNormalizeFromOrder(order: Uint32Array, sorted: Float64Array, table: ArrayLike<number>, out: Float64Array): Float64Array {
  const n = sorted.length;
  const denominator = n + 0.25;
  let i = 0;
  while (i < n) {
    const v = sorted[i];
    let j = i + 1;
    while (j < n && sorted[j] === v) j++;
    if (j === i + 1) {
      out[order[i]] = table[i];
    } else {
      const z = normalQuantile(((i + 1 + j) / 2 - 0.375) / denominator);
      for (let k = i; k < j; k++) out[order[k]] = z;
    }
    i = j;
  }
  return out;
}

/**
 * Sorting permutation and sorted values of the folded draws |x - median|, from those of the
 * draws, by merging the distances below and above the median (no second sort).
 */
export function foldedOrderFromOrder(order: Uint32Array, sorted: Float64Array, median: number, outOrder: Uint32Array, outSorted: Float64Array): void {
  const n = sorted.length;
  const split = lowerBound(sorted, median);
  let below = split - 1;
  let above = split;
  for (let k = 0; k < n; k++) {
    const a = below >= 0 ? median - sorted[below] : Infinity;
    const b = above < n ? sorted[above] - median : Infinity;
    if (a <= b) {
      outOrder[k] = order[below];
      outSorted[k] = a;
      below--;
    } else {
      outOrder[k] = order[above];
      outSorted[k] = b;
      above++;
    }
  }
}

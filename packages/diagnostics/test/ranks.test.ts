import { describe, expect, it } from 'vitest';
import { averageRanks, normalQuantile, normalScoreTable, rankNormalize, sortedCopy } from '../src/index.js';
import { createRadixSortBuffers, radixArgsort } from '../src/radixArgsort.js';
import { foldedOrderFromOrder, rankNormalizeFromOrder, sortedFolded } from '../src/ranks.js';
import { createRandom, normalDraws } from './support/random.js';

describe('ranks', () => {
  it('average ranks give ties the mean of their positions (hand-computed example)', () => {
    // values 3, 1, 4, 1, 5: the two 1s share ranks 1 and 2 -> 1.5; then 3 -> 3, 4 -> 4, 5 -> 5
    expect(Array.from(averageRanks([3, 1, 4, 1, 5]))).toEqual([3, 1.5, 4, 1.5, 5]);
    expect(Array.from(averageRanks([2, 2, 2]))).toEqual([2, 2, 2]);
  });

  it('rank normalisation is z = Phi^{-1}((r - 3/8)/(S + 1/4)) (Blom 1958; Vehtari et al. 2021)', () => {
    const values = [0.3, -2, 7, 0.3, 1];
    const ranks = averageRanks(values);
    const out = rankNormalize(values, sortedCopy(values), normalScoreTable(5), new Float64Array(5));
    for (let i = 0; i < 5; i++) expect(out[i]).toBeCloseTo(normalQuantile((ranks[i] - 0.375) / 5.25), 15);
  });

  it('the argsort agrees with the built-in numeric sort, with negatives, zeros, ties and wide magnitudes (comparison and radix routes)', () => {
    const rng = createRandom(9);
    for (const n of [5000, 20000]) {
      const values = new Float64Array(n);
      for (let i = 0; i < n; i++) {
        const u = rng.uniform();
        values[i] = u < 0.1 ? 0 : u < 0.15 ? -0 : u < 0.3 ? Math.round(10 * rng.normal()) : rng.normal() * 10 ** Math.round(20 * rng.uniform() - 10);
      }
      const order = new Uint32Array(n);
      const sorted = new Float64Array(n);
      radixArgsort(values, order, sorted, createRadixSortBuffers(n));
      const reference = sortedCopy(values);
      for (let i = 0; i < n; i++) {
        expect(sorted[i] === reference[i]).toBe(true);
        expect(values[order[i]]).toBe(sorted[i]);
      }
      expect(new Set(order).size).toBe(n);
    }
  });

  it('the radix argsort handles keys whose digits coincide (skipped passes): small integers, a narrow range, negatives only', () => {
    const rng = createRandom(19);
    const n = 20000;
    const cases = [
      (i: number) => Math.round(50 * rng.normal()) + 0 * i, // low word all zero: passes 1 and 2 skipped
      () => 1 + 1e-5 * rng.uniform(), // one sign, exponent and leading mantissa: pass 4 skipped
      () => -Math.exp(rng.normal()),
    ];
    for (const make of cases) {
      const values = Float64Array.from({ length: n }, (_, i) => make(i));
      const order = new Uint32Array(n);
      const sorted = new Float64Array(n);
      radixArgsort(values, order, sorted, createRadixSortBuffers(n));
      const reference = sortedCopy(values);
      for (let i = 0; i < n; i++) {
        expect(sorted[i]).toBe(reference[i]);
        expect(values[order[i]]).toBe(sorted[i]);
      }
    }
  });

  it('scores from the sort permutation equal scores by binary search; folded order equals sorting |x - median|', () => {
    const rng = createRandom(10);
    const n = 3001;
    const values = normalDraws(rng, n).map((v) => Math.round(v * 20) / 20); // many ties
    const order = new Uint32Array(n);
    const sorted = new Float64Array(n);
    radixArgsort(values, order, sorted, createRadixSortBuffers(n));
    const table = normalScoreTable(n);
    const a = rankNormalize(values, sorted, table, new Float64Array(n));
    const b = rankNormalizeFromOrder(order, sorted, table, new Float64Array(n));
    for (let i = 0; i < n; i++) expect(b[i]).toBeCloseTo(a[i], 14);
    const median = sorted[(n - 1) / 2];
    const foldedOrder = new Uint32Array(n);
    const foldedSorted = new Float64Array(n);
    foldedOrderFromOrder(order, sorted, median, foldedOrder, foldedSorted);
    const reference = sortedCopy(values.map((v) => Math.abs(v - median)));
    const merged = sortedFolded(sorted, median, new Float64Array(n));
    for (let i = 0; i < n; i++) {
      expect(foldedSorted[i]).toBe(reference[i]);
      expect(merged[i]).toBe(reference[i]);
      expect(Math.abs(values[foldedOrder[i]] - median)).toBe(foldedSorted[i]);
    }
  });
});

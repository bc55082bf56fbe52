import { describe, expect, it } from 'vitest';
import { pooledRanks, rankCounts, summarise } from '../src/index.js';
import { quantileSorted } from '../src/stats/quantile.js';
import { normalStream } from './synthetic.js';

describe('pooledRanks (Vehtari et al. 2021, sec. 4: ranks of pooled draws, ties averaged)', () => {
  it('averages tied ranks', () => {
    const [a, b] = pooledRanks([[2, 1], [3, 2]]);
    expect(Array.from(a)).toEqual([2.5, 1]);
    expect(Array.from(b)).toEqual([4, 2.5]);
  });
  it('counts every draw exactly once, evenly for interleaved chains', () => {
    const chains = [Float64Array.from({ length: 100 }, (_, i) => 2 * i), Float64Array.from({ length: 100 }, (_, i) => 2 * i + 1)];
    const ranks = pooledRanks(chains);
    const counts = ranks.map((r) => rankCounts(r, 200, 10));
    for (const c of counts) {
      expect(c.reduce((s, v) => s + v, 0)).toBe(100);
      for (const v of c) expect(v).toBe(10);
    }
  });
});

describe('quantileSorted (Hyndman & Fan 1996, definition 7)', () => {
  it('interpolates between order statistics', () => {
    const x = Float64Array.from({ length: 10 }, (_, i) => i + 1);
    // h = (n − 1) p + 1 = 1.45 → x1 + 0.45 (x2 − x1) (their eq. for Q7).
    expect(quantileSorted(x, 0.05)).toBeCloseTo(1.45, 12);
    expect(quantileSorted(x, 0.5)).toBeCloseTo(5.5, 12);
    expect(quantileSorted(x, 1)).toBe(10);
  });
});

describe('summarise', () => {
  it('recovers a normal’s mean, sd and 5 %/95 % quantiles within Monte Carlo error', () => {
    const normal = normalStream(99);
    const chains = Array.from({ length: 4 }, () => Float64Array.from({ length: 10_000 }, () => 5 + 2 * normal()));
    const { rows, missing } = summarise(['x'], [chains]);
    expect(missing).toBeUndefined();
    const r = rows[0];
    const n = 40_000;
    // Standard errors for independent draws: sd/√n for the mean; sd/√(2n) for the
    // sd; √(p(1−p)/n)/φ(z_p) for quantiles (asymptotic, standard results).
    // z_0.95 = 1.6449 and φ(z) = 0.10314 (normal tables, from memory).
    expect(Math.abs(r.mean - 5)).toBeLessThan(4 * (2 / Math.sqrt(n)));
    expect(Math.abs(r.sd - 2)).toBeLessThan(4 * (2 / Math.sqrt(2 * n)));
    const seQ = (2 * Math.sqrt(0.05 * 0.95 / n)) / 0.10314;
    expect(Math.abs(r.q05 - (5 - 2 * 1.6449))).toBeLessThan(4 * seQ);
    expect(Math.abs(r.q95 - (5 + 2 * 1.6449))).toBeLessThan(4 * seQ);
    expect(Math.abs(r.q50 - 5)).toBeLessThan(4 * ((2 * Math.sqrt(0.25 / n)) / 0.39894));
  });
});

describe('summarise on runs too short for the diagnostics', () => {
  it('still gives pooled moments and says why the rest is missing', () => {
    const { rows, missing } = summarise(['x'], [[Float64Array.of(1, 2, 3), Float64Array.of(4, 5, 6)]]);
    expect(rows[0].mean).toBe(3.5);
    expect(rows[0].q50).toBe(3.5);
    expect(rows[0].rhat).toBeUndefined();
    expect(missing).toMatch(/at least \d+ draws per chain; this run has 3/);
  });
});

import { describe, expect, it } from 'vitest';
import { splitRhat, splitRhatBasic, splitRhatBulk, splitRhatFolded } from '../src/index.js';
import { ar1Chain, chainsOf, createRandom, normalDraws } from './support/random.js';

describe('split R-hat', () => {
  it('classic split R-hat of a hand-computed example is sqrt(1.43) (Gelman et al., BDA3, sec. 11.4 formulas)', () => {
    // Halves [1,2,3,4] [5,6,7,8] [2,4,6,8] [1,3,5,7]: W = 25/6, B/n = 17/6,
    // var+ = (3/4) W + B/n = 143/24, R-hat^2 = var+/W = 1.43.
    const chains = [
      [1, 2, 3, 4, 5, 6, 7, 8],
      [2, 4, 6, 8, 1, 3, 5, 7],
    ];
    expect(splitRhatBasic(chains)).toBeCloseTo(Math.sqrt(1.43), 14);
    // an odd-length chain drops its middle draw: inserting one must not change the result
    expect(splitRhatBasic([[1, 2, 3, 4, 100, 5, 6, 7, 8], [2, 4, 6, 8, -50, 1, 3, 5, 7]])).toBeCloseTo(Math.sqrt(1.43), 14);
  });

  it('is near 1 for independent draws: below 1.005 for 4 x 2000 (Vehtari et al. 2021)', () => {
    // For independent draws R-hat - 1 is of order 1/N (here ~1e-4); 1.005 is far outside its spread.
    for (const seed of [1, 2, 3, 4, 5]) {
      const rng = createRandom(seed);
      const r = splitRhat(chainsOf(4, () => normalDraws(rng, 2000)));
      expect(r).toBeLessThan(1.005);
      expect(r).toBeGreaterThan(0.995);
    }
  });

  it('one chain shifted by one sd: R-hat well above 1.01, caught by the bulk part', () => {
    // Expected (common practice, by the formula): with 1 of 4 chains moved by 1 sd the split
    // means have variance ~0.21, so R-hat ~ sqrt(1.21) ~ 1.1.
    const rng = createRandom(6);
    const chains = chainsOf(4, (c) => normalDraws(rng, 2000).map((v) => v + (c === 0 ? 1 : 0)));
    expect(splitRhat(chains)).toBeGreaterThan(1.05);
    expect(splitRhatBulk(chains)).toBeGreaterThan(1.05);
  });

  it('one chain scaled by 3: the bulk R-hat misses it, the folded R-hat catches it (Vehtari et al. 2021, folded R-hat)', () => {
    const rng = createRandom(7);
    const chains = chainsOf(4, (c) => normalDraws(rng, 2000).map((v) => (c === 0 ? 3 * v : v)));
    expect(splitRhatBulk(chains)).toBeLessThan(1.01);
    expect(splitRhatBasic(chains)).toBeLessThan(1.01);
    expect(splitRhatFolded(chains)).toBeGreaterThan(1.05);
    expect(splitRhat(chains)).toBe(splitRhatFolded(chains));
  });

  it('the bulk R-hat depends on ranks only: unchanged by a monotone transformation', () => {
    const rng = createRandom(8);
    const chains = chainsOf(3, () => ar1Chain(rng, 500, 0.6));
    expect(splitRhatBulk(chains.map((c) => c.map(Math.exp)))).toBe(splitRhatBulk(chains));
  });

  it('is the larger of bulk and folded', () => {
    const rng = createRandom(9);
    const chains = chainsOf(4, () => ar1Chain(rng, 300, 0.8));
    expect(splitRhat(chains)).toBe(Math.max(splitRhatBulk(chains), splitRhatFolded(chains)));
  });

  it('is undefined (NaN) for constant chains and infinite when each chain is stuck at its own value', () => {
    expect(splitRhat([new Float64Array(10).fill(2), new Float64Array(10).fill(2)])).toBeNaN();
    expect(splitRhat([new Float64Array(10).fill(2), new Float64Array(10).fill(3)])).toBe(Infinity);
  });
});

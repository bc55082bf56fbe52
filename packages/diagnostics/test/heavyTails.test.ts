import { describe, expect, it } from 'vitest';
import { bulkEss, essOfMean, normalQuantile, splitRhatBulk, splitRhatFolded, tailEss } from '../src/index.js';
import { ar1Chain, cauchyDraws, chainsOf, createRandom } from './support/random.js';

/**
 * Heavy tails, after the Cauchy example of Vehtari et al. (2021, Bayesian Analysis 16, 667;
 * from memory): rank-normalised bulk- and tail-ESS stay well defined because they use
 * only ranks, while the classic ESS of the mean — of a distribution with no mean — is
 * unreliable; the folded R-hat detects chains that differ in scale.
 */
describe('heavy tails (Cauchy draws)', () => {
  it('bulk- and tail-ESS depend on ranks only: identical for normal and Cauchy draws made from the same uniforms', () => {
    const rng = createRandom(31);
    const uniforms = chainsOf(4, () => {
      const u = new Float64Array(1000);
      for (let i = 0; i < u.length; i++) u[i] = rng.uniform();
      return u;
    });
    const normal = uniforms.map((c) => c.map(normalQuantile));
    const cauchy = uniforms.map((c) => c.map((u) => Math.tan(Math.PI * (u - 0.5))));
    expect(bulkEss(cauchy)).toBeCloseTo(bulkEss(normal), 9);
    expect(tailEss(cauchy)).toBeCloseTo(tailEss(normal), 9);
  });

  it('for independent Cauchy draws, bulk- and tail-ESS are near S = 4000 (within 20%; pilot sd 4.2% and 4.3%)', () => {
    for (const seed of [32, 33, 34]) {
      const rng = createRandom(seed);
      const chains = chainsOf(4, () => cauchyDraws(rng, 1000));
      expect(Math.abs(bulkEss(chains) / 4000 - 1)).toBeLessThan(0.2);
      expect(Math.abs(tailEss(chains) / 4000 - 1)).toBeLessThan(0.2);
    }
  });

  it('on autocorrelated Cauchy chains the classic ESS of the mean is blind to the autocorrelation; bulk-ESS is not', () => {
    // x_t / y_t with x, y independent AR(1) (phi = 0.8) is Cauchy at every t and positively
    // autocorrelated, so no honest ESS can exceed S = 4000. A few extreme draws dominate the
    // classic autocovariances, so over 40 replications its median is about S whatever phi is,
    // and it claims more than S ("better than independent") in most replications (in a
    // 100-replication pilot: medians 4009-4015, 59-71 of 100 above S, up to 3.6 S).
    // Bulk-ESS sees the dependence (pilot median about 0.52 S, never above 0.63 S).
    const rng = createRandom(35);
    const bulk: number[] = [];
    const classic: number[] = [];
    for (let r = 0; r < 40; r++) {
      const chains = chainsOf(4, () => {
        const x = ar1Chain(rng, 1000, 0.8);
        const y = ar1Chain(rng, 1000, 0.8);
        return x.map((v, i) => v / y[i]);
      });
      bulk.push(bulkEss(chains));
      classic.push(essOfMean(chains));
    }
    const median = (a: number[]) => [...a].sort((u, v) => u - v)[Math.floor(a.length / 2)];
    expect(Math.abs(median(classic) / 4000 - 1)).toBeLessThan(0.05);
    expect(classic.filter((v) => v > 4000).length).toBeGreaterThan(20);
    expect(median(bulk)).toBeLessThan(0.65 * 4000);
    expect(Math.max(...bulk)).toBeLessThan(4000);
  });

  it('folded R-hat catches one Cauchy chain with three times the scale; bulk R-hat does not', () => {
    const rng = createRandom(36);
    const chains = chainsOf(4, (c) => cauchyDraws(rng, 2000).map((v) => (c === 0 ? 3 * v : v)));
    expect(splitRhatFolded(chains)).toBeGreaterThan(1.05);
    expect(splitRhatBulk(chains)).toBeLessThan(1.01);
  });
});

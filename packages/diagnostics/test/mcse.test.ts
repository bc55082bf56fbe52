import { describe, expect, it } from 'vitest';
import { mcseOfMean, mcseOfQuantile, mcseOfQuantileDetailed, mcseOfSd, quantileOfSorted, sortedCopy } from '../src/index.js';
import { ar1Chain, chainsOf, createRandom } from './support/random.js';
import { meanAndSd } from './support/numeric.js';

/**
 * MCSE against replication: over R independent replications of 4 AR(1) chains, the sd of
 * an estimate across replications is the truth the MCSE estimates. The sd from R = 400
 * replications has a relative standard error of 1/sqrt(2(R - 1)) ≈ 3.5% (normal theory),
 * and the root-mean-square MCSE is averaged over the same 400, so a 15% tolerance is about
 * 4 Monte Carlo standard errors (slightly more for quantiles, whose estimates move in
 * steps of order statistics).
 */
function replicate(R: number, draws: number, phi: number, seed: number): Float64Array[][] {
  const rng = createRandom(seed);
  return Array.from({ length: R }, () => chainsOf(4, () => ar1Chain(rng, draws, phi)));
}

function rms(values: number[]): number {
  return Math.sqrt(values.reduce((s, v) => s + v * v, 0) / values.length);
}

const pooledOf = (chains: Float64Array[]) => Float64Array.from(chains.flatMap((c) => Array.from(c)));

describe('MCSE against the spread over independent replications', () => {
  const reps = replicate(400, 500, 0.5, 77);

  it('MCSE of the mean matches the sd of the means (within 15%)', () => {
    const means = reps.map((chains) => pooledOf(chains).reduce((s, v) => s + v, 0) / 2000);
    const ratio = rms(reps.map((c) => mcseOfMean(c))) / meanAndSd(means).sd;
    expect(Math.abs(ratio - 1)).toBeLessThan(0.15);
  });

  it('MCSE of the sd matches the sd of the sample sds (within 15%)', () => {
    const sds = reps.map((chains) => meanAndSd(Array.from(pooledOf(chains))).sd);
    const ratio = rms(reps.map((c) => mcseOfSd(c))) / meanAndSd(sds).sd;
    expect(Math.abs(ratio - 1)).toBeLessThan(0.15);
  });

  for (const p of [0.5, 0.05]) {
    it(`MCSE of the ${100 * p}% quantile (beta/ESS method, Vehtari et al. 2021) matches the sd of the quantiles (within 20%)`, () => {
      const estimates = reps.map((chains) => quantileOfSorted(sortedCopy(pooledOf(chains)), p));
      const ratio = rms(reps.map((c) => mcseOfQuantile(c, p))) / meanAndSd(estimates).sd;
      expect(Math.abs(ratio - 1)).toBeLessThan(0.2);
    });
  }

  it('the quantile MCSE interval brackets the estimate and its ESS is that of the indicator', () => {
    const d = mcseOfQuantileDetailed(reps[0], 0.25);
    expect(d.lower).toBeLessThan(d.value);
    expect(d.upper).toBeGreaterThan(d.value);
    expect(d.mcse).toBeCloseTo((d.upper - d.lower) / 2, 15);
    expect(d.ess).toBeGreaterThan(100);
  });

  it('constant draws have zero MCSE', () => {
    const constant = [new Float64Array(20).fill(1), new Float64Array(20).fill(1)];
    expect(mcseOfMean(constant)).toBe(0);
    expect(mcseOfSd(constant)).toBe(0);
    expect(mcseOfQuantile(constant, 0.5)).toBe(0);
  });
});

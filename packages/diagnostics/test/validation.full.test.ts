import { describe, expect, it } from 'vitest';
import { addDraws, bulkEss, createRunningDiagnostics, essOfMean, mcseOfMean, mcseOfQuantile, normalQuantile, quantileOfSorted, readRunningDiagnostics, sortedCopy, splitRhat, tailEss } from '../src/index.js';
import { ar1Chain, chainsOf, createRandom, normalDraws } from './support/random.js';
import { meanAndSd, simpson } from './support/numeric.js';

/**
 * Long statistical validations (APSIS_FULL=1): replication studies behind the tolerances of
 * the fast tests. Each states its Monte Carlo error.
 */
function indicatorEssFactor(phi: number, p: number): number {
  // Plackett (1954, Biometrika 41, 351): d Phi2(q, q; r)/dr = exp(-q^2/(1 + r)) / (2 pi sqrt(1 - r^2))
  const q = normalQuantile(p);
  const f = (r: number) => Math.exp((-q * q) / (1 + r)) / (2 * Math.PI * Math.sqrt(1 - r * r));
  let tau = 1;
  for (let t = 1; Math.abs(phi) ** t > 1e-12; t++) tau += (2 * simpson(f, 0, phi ** t, 2000)) / (p * (1 - p));
  return 1 / tau;
}

describe.runIf(process.env.APSIS_FULL === '1')('full validation: replication studies', () => {
  for (const phi of [0, 0.5, 0.9, -0.3]) {
    it(`AR(1) phi = ${phi}: over 50 replications of 4 x 25000, mean bulk-ESS within 3% of S (1 - phi)/(1 + phi) (standard result), relative sd below 5%; mean tail-ESS within 5% of the analytic indicator value`, () => {
      const rng = createRandom(9000 + Math.round(100 * phi));
      const S = 100_000;
      const bulk: number[] = [];
      const tail: number[] = [];
      for (let r = 0; r < 50; r++) {
        const chains = chainsOf(4, () => ar1Chain(rng, 25_000, phi));
        bulk.push(bulkEss(chains));
        tail.push(tailEss(chains));
      }
      const b = meanAndSd(bulk);
      const expected = (S * (1 - phi)) / (1 + phi);
      // the mean of 50 has relative standard error below 5%/sqrt(50) = 0.7%: 3% is > 4 of them
      expect(Math.abs(b.mean / expected - 1)).toBeLessThan(0.03);
      expect(b.sd / expected).toBeLessThan(0.05);
      const t = meanAndSd(tail);
      // min of two estimates is biased low by about half an sd (~2%), hence 5%
      expect(Math.abs(t.mean / (S * indicatorEssFactor(phi, 0.05)) - 1)).toBeLessThan(0.05);
    });
  }

  it('independent draws: R-hat of 4 x 1000 stays below 1.01 in 200 of 200 replications (false alarms are rare)', () => {
    const rng = createRandom(9100);
    let above = 0;
    for (let r = 0; r < 200; r++) if (splitRhat(chainsOf(4, () => normalDraws(rng, 1000))) > 1.01) above++;
    expect(above).toBe(0);
  });

  it('MCSE of the mean and of the median over 2000 replications of 4 x 250 AR(1) (phi 0.7): within 7% (sd of the sd estimate 1.6%)', () => {
    const rng = createRandom(9200);
    const means: number[] = [];
    const medians: number[] = [];
    const mcseMean: number[] = [];
    const mcseMedian: number[] = [];
    for (let r = 0; r < 2000; r++) {
      const chains = chainsOf(4, () => ar1Chain(rng, 250, 0.7));
      const pooled = sortedCopy(Float64Array.from(chains.flatMap((c) => Array.from(c))));
      means.push(pooled.reduce((s, v) => s + v, 0) / pooled.length);
      medians.push(quantileOfSorted(pooled, 0.5));
      mcseMean.push(mcseOfMean(chains) ** 2);
      mcseMedian.push(mcseOfQuantile(chains, 0.5) ** 2);
    }
    const rms = (v: number[]) => Math.sqrt(v.reduce((s, x) => s + x, 0) / v.length);
    expect(Math.abs(rms(mcseMean) / meanAndSd(means).sd - 1)).toBeLessThan(0.07);
    expect(Math.abs(rms(mcseMedian) / meanAndSd(medians).sd - 1)).toBeLessThan(0.1);
  });

  it('running diagnostics on 4 x 2e5 AR(1) (phi 0.9) draws: ESS exact, rank R-hat within 0.003 of splitRhat', () => {
    const rng = createRandom(9300);
    const chains = chainsOf(4, () => ar1Chain(rng, 200_000, 0.9));
    const state = createRunningDiagnostics({ chains: 4 });
    for (let i = 0; i < 200_000; i += 5000) for (let c = 0; c < 4; c++) addDraws(state, c, chains[c].subarray(i, i + 5000));
    const q = readRunningDiagnostics(state).quantities[0];
    expect(q.essMethod).toBe('autocorrelation');
    expect(Math.abs(q.ess! / essOfMean(chains, { split: false }) - 1)).toBeLessThan(1e-8);
    expect(Math.abs(q.rhat! - splitRhat(chains))).toBeLessThan(0.003);
  });
});

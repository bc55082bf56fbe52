import { describe, expect, it } from 'vitest';
import { autocovariance, bulkEss, essFromAutocovariances, essOfMean, essOfQuantile, essOfSd, normalQuantile, tailEss } from '../src/index.js';
import { splitEssPair } from '../src/seriesEss.js';
import { poolChains, splitHalves } from '../src/splitChains.js';
import { createDiagnosticsWorkspace } from '../src/workspace.js';
import { ar1Chain, chainsOf, createRandom, normalDraws } from './support/random.js';
import { simpson } from './support/numeric.js';

/**
 * Integrated autocorrelation time of the indicator I(x ≤ q) of a stationary Gaussian AR(1)
 * with lag-t correlation phi^t. By Plackett's identity (Plackett 1954, Biometrika 41, 351),
 * d Phi2(q, q; r)/dr = phi2(q, q; r) = exp(-q^2/(1 + r)) / (2 pi sqrt(1 - r^2)), so
 * Cov(I_s, I_{s+t}) = integral_0^{phi^t} exp(-q^2/(1 + r)) / (2 pi sqrt(1 - r^2)) dr.
 */
function indicatorEssFactor(phi: number, p: number): number {
  const q = normalQuantile(p);
  const f = (r: number) => Math.exp((-q * q) / (1 + r)) / (2 * Math.PI * Math.sqrt(1 - r * r));
  let tau = 1;
  for (let t = 1; Math.abs(phi) ** t > 1e-12; t++) tau += (2 * simpson(f, 0, phi ** t, 2000)) / (p * (1 - p));
  return 1 / tau;
}

describe('ESS of AR(1) chains (standard time-series result: ESS = S (1 - phi)/(1 + phi))', () => {
  // 4 chains x 1e5 draws. In a 20-replication pilot at 4 x 25000 the relative sd of bulk-ESS
  // was 1.4% (phi 0), 2.3% (0.5), 3.4% (0.9), 2.3% (-0.3); at 4 x 1e5 it halves, so the 10%
  // tolerance is at least 5 Monte Carlo standard errors.
  const rng = createRandom(2021);
  for (const phi of [0, 0.5, 0.9, -0.3]) {
    it(`phi = ${phi}: bulk-ESS and ESS of the mean within 10%; tail-ESS within 10% of the indicator's analytic value`, () => {
      const chains = chainsOf(4, () => ar1Chain(rng, 100_000, phi));
      const S = 400_000;
      const expected = (S * (1 - phi)) / (1 + phi);
      expect(Math.abs(bulkEss(chains) / expected - 1)).toBeLessThan(0.1);
      expect(Math.abs(essOfMean(chains) / expected - 1)).toBeLessThan(0.1);
      const tailExpected = S * indicatorEssFactor(phi, 0.05);
      expect(Math.abs(tailEss(chains) / tailExpected - 1)).toBeLessThan(0.1);
    });
  }

  it('ESS of the sd: squared centred draws of a Gaussian AR(1) have lag correlation phi^(2t) (Isserlis), so ESS = S (1 - phi^2)/(1 + phi^2), within 10%', () => {
    for (const phi of [0.5, 0.9]) {
      const chains = chainsOf(4, () => ar1Chain(rng, 100_000, phi));
      const expected = (400_000 * (1 - phi * phi)) / (1 + phi * phi);
      expect(Math.abs(essOfSd(chains) / expected - 1)).toBeLessThan(0.1);
    }
  });
});

describe('ESS of independent draws', () => {
  it('bulk- and tail-ESS are near S = 8000 for 4 x 2000 (within 15%, about 4.5 pilot sd of 3.3%)', () => {
    for (const seed of [11, 12, 13]) {
      const rng = createRandom(seed);
      const chains = chainsOf(4, () => normalDraws(rng, 2000));
      expect(Math.abs(bulkEss(chains) / 8000 - 1)).toBeLessThan(0.15);
      expect(Math.abs(tailEss(chains) / 8000 - 1)).toBeLessThan(0.15);
    }
  });

  it('tail-ESS is the smaller of the 5% and 95% quantile ESS', () => {
    const rng = createRandom(14);
    const chains = chainsOf(4, () => ar1Chain(rng, 3000, 0.7));
    expect(tailEss(chains)).toBe(Math.min(essOfQuantile(chains, 0.05), essOfQuantile(chains, 0.95)));
  });

  it('whole-chain ESS (split: false) of independent chains is also near S', () => {
    const rng = createRandom(15);
    const chains = chainsOf(4, () => normalDraws(rng, 5000));
    expect(Math.abs(essOfMean(chains, { split: false }) / 20000 - 1)).toBeLessThan(0.1);
  });
});

describe('the direct-lag and FFT routes of the ESS agree', () => {
  for (const phi of [0.2, 0.97]) {
    it(`phi = ${phi}: hybrid route equals all-lags FFT + Geyer to 1e-10 relative`, () => {
      const rng = createRandom(16);
      const chains = chainsOf(4, () => ar1Chain(rng, 3000, phi));
      const ws = createDiagnosticsWorkspace(4, 3000);
      const pooled = poolChains(chains);
      const [hybrid] = splitEssPair(ws, pooled, null);
      const halves = splitHalves(pooled, 4, 3000);
      const means = halves.map((h) => h.reduce((s, v) => s + v, 0) / h.length);
      const reference = essFromAutocovariances({ chains: 8, draws: 1500, means, acov: halves.map((h) => autocovariance(h)) }).ess;
      expect(Math.abs(hybrid / reference - 1)).toBeLessThan(1e-10);
    });
  }
});

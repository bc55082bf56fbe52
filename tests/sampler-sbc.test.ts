import { describe, expect, it } from 'vitest';
import { createRandomStream, runChains, type Target } from '@apsis/core';
import { chiSquareUpperTail } from '../packages/core/test/support/mcse.js';

// Simulation-based calibration (Talts, Betancourt, Simpson, Vehtari & Gelman 2018,
// arXiv:1804.06788, algorithm 1): draw parameters from the prior, data from the model,
// then sample the posterior; the rank of the true value among L thinned posterior draws
// is uniform on {0, …, L} for a correct sampler. Uniformity is judged by a chi-square
// test on binned ranks (their sec. 4.1), at a fixed seed, failing below p = 0.001 per
// quantity.
//
// Model: an invented eight-group normal hierarchy in non-centred form,
//   μ ~ N(0, 5²), τ ~ half-N(0, 5²), η_j ~ N(0, 1), y_j ~ N(μ + τ η_j, σ_j²),
// sampled on (μ, log τ, η_1 … η_8) with the log-Jacobian of τ = e^u.
const sigma = [9, 12, 7, 14, 10, 11, 8, 13];
const groups = sigma.length;

function hierarchy(y: readonly number[]): Target {
  return {
    dim: 2 + groups,
    logDensityGrad(x, g) {
      const mu = x[0];
      const u = x[1];
      const tau = Math.exp(u);
      let lp = -(mu * mu) / 50 - (tau * tau) / 50 + u;
      let gMu = -mu / 25;
      let gU = 1 - (tau * tau) / 25;
      for (let j = 0; j < groups; j++) {
        const eta = x[2 + j];
        const s2 = sigma[j] * sigma[j];
        const r = y[j] - mu - tau * eta;
        lp += -0.5 * eta * eta - (r * r) / (2 * s2);
        gMu += r / s2;
        gU += (r / s2) * tau * eta;
        g[2 + j] = -eta + (tau * r) / s2;
      }
      g[0] = gMu;
      g[1] = gU;
      return lp;
    },
  };
}

interface SbcConfig {
  replications: number;
  warmup: number;
  draws: number;
  thin: number;
  bins: number;
}

/** Quantities ranked: μ, log τ, η_1 and θ_1 = μ + τ η_1. */
const quantities = ['mu', 'logTau', 'eta1', 'theta1'] as const;

function quantityValues(x: ArrayLike<number>, offset: number): number[] {
  const mu = x[offset];
  const u = x[offset + 1];
  const eta1 = x[offset + 2];
  return [mu, u, eta1, mu + Math.exp(u) * eta1];
}

async function calibrate(config: SbcConfig): Promise<{ pValues: number[]; divergent: number }> {
  const ranksPerBin = (config.draws / config.thin + 1) / config.bins;
  if (!Number.isInteger(ranksPerBin)) throw new Error('ranks must split evenly into bins');
  const counts = quantities.map(() => new Float64Array(config.bins));
  let divergent = 0;
  for (let rep = 0; rep < config.replications; rep++) {
    const rng = createRandomStream(`sbc replication ${rep}`);
    const mu = 5 * rng.normal();
    const tau = Math.abs(5 * rng.normal());
    const eta = Array.from({ length: groups }, () => rng.normal());
    const y = eta.map((e, j) => mu + tau * e + sigma[j] * rng.normal());
    const truth = quantityValues([mu, Math.log(tau), eta[0]], 0);
    const r = await runChains(hierarchy(y), {
      chains: 1,
      warmup: config.warmup,
      draws: config.draws,
      seed: 5000 + rep,
      targetAcceptance: 0.9,
    });
    divergent += r.divergences[0];
    const d = r.draws[0];
    const dim = 2 + groups;
    const ranks = quantities.map(() => 0);
    for (let k = config.thin - 1; k < config.draws; k += config.thin) {
      const v = quantityValues(d, k * dim);
      for (let q = 0; q < quantities.length; q++) if (v[q] < truth[q]) ranks[q] += 1;
    }
    for (let q = 0; q < quantities.length; q++) counts[q][Math.floor(ranks[q] / ranksPerBin)] += 1;
  }
  const expected = config.replications / config.bins;
  const pValues = counts.map((c) => {
    let chi = 0;
    for (const o of c) chi += (o - expected) ** 2 / expected;
    return chiSquareUpperTail(chi, config.bins - 1);
  });
  return { pValues, divergent };
}

describe('simulation-based calibration on a non-centred hierarchy', () => {
  it('fast subset: 200 replications, 19 thinned draws each, uniform ranks', async () => {
    const { pValues, divergent } = await calibrate({ replications: 200, warmup: 300, draws: 380, thin: 20, bins: 10 });
    for (let q = 0; q < quantities.length; q++) {
      expect(pValues[q], `rank uniformity of ${quantities[q]}`).toBeGreaterThan(0.001);
    }
    // Non-centred with target acceptance 0.9: divergences stay rare (under 0.5% of draws).
    expect(divergent).toBeLessThan(0.005 * 200 * 380);
  });
});

describe.runIf(process.env.APSIS_FULL === '1')('simulation-based calibration, full run', () => {
  it('1000 replications, 99 thinned draws each, uniform ranks', async () => {
    const { pValues } = await calibrate({ replications: 1000, warmup: 500, draws: 990, thin: 10, bins: 20 });
    for (let q = 0; q < quantities.length; q++) {
      expect(pValues[q], `rank uniformity of ${quantities[q]}`).toBeGreaterThan(0.001);
    }
  }, 1_800_000);
});

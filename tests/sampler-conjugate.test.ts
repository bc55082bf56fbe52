import { describe, expect, it } from 'vitest';
import { createRandomStream, runChains, type Target } from '@apsis/core';
import { column, meanWithMcse, varianceWithMcse } from '../packages/core/test/support/mcse.js';

// Normal likelihood with known variance σ² and a normal prior N(μ0, τ0²) on the mean:
// the posterior is N(μn, τn²) with 1/τn² = 1/τ0² + n/σ² and
// μn = (μ0/τ0² + n ȳ/σ²) τn² (Gelman et al., Bayesian Data Analysis, 3rd ed., sec. 2.5,
// eqs. 2.11–2.12). Data are simulated (invented) at a fixed seed.
describe('conjugate normal model with known variance', () => {
  const sigma = 3;
  const mu0 = 10;
  const tau0 = 2;
  const rng = createRandomStream('conjugate normal data');
  const y = Array.from({ length: 20 }, () => 4 + sigma * rng.normal());
  const n = y.length;
  const ybar = y.reduce((a, b) => a + b, 0) / n;
  const precision = 1 / tau0 ** 2 + n / sigma ** 2;
  const postMean = (mu0 / tau0 ** 2 + (n * ybar) / sigma ** 2) / precision;
  const postVar = 1 / precision;

  const target: Target = {
    dim: 1,
    logDensityGrad(x, g) {
      const theta = x[0];
      let lp = -((theta - mu0) ** 2) / (2 * tau0 ** 2);
      let d = -(theta - mu0) / tau0 ** 2;
      for (const yi of y) {
        lp -= (yi - theta) ** 2 / (2 * sigma ** 2);
        d += (yi - theta) / sigma ** 2;
      }
      g[0] = d;
      return lp;
    },
  };

  // Static HMC gets step-size jitter: a fixed path on a 1-D Gaussian can resonate with
  // its period and stop exploring (Neal 2011, "MCMC using Hamiltonian dynamics", sec. 3.2).
  it.each([
    ['nuts', {}],
    ['hmc', { method: 'hmc', jitter: 0.5 }],
  ] as const)('%s: posterior mean and sd match the closed form within 4 MCSE', async (_, extra) => {
    const r = await runChains(target, { seed: 301, ...extra });
    const xs = r.draws.map((d) => column(d, 1, 0));
    const m = meanWithMcse(xs);
    const v = varianceWithMcse(xs, postMean);
    expect(Math.abs(m.mean - postMean)).toBeLessThan(4 * m.mcse);
    expect(Math.abs(v.variance - postVar)).toBeLessThan(4 * v.mcse);
    // sd within the delta-method image of the variance tolerance: |Δsd| ≈ |Δvar| / (2 sd).
    expect(Math.abs(Math.sqrt(v.variance) - Math.sqrt(postVar))).toBeLessThan((4 * v.mcse) / (2 * Math.sqrt(postVar)) * 1.05);
    expect(r.divergences.reduce((a, b) => a + b, 0)).toBe(0);
  });
});

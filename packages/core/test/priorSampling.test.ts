import { describe, expect, it } from 'vitest';
import { runChains } from '../src/sampler/index.js';
import { compileModel, priors, supports, type ParameterDeclaration } from '../src/model/index.js';
import { mcseOfMeanOf as mcseOfMean } from './support/modelMcse.js';

/**
 * Sampling each prior alone (no likelihood) through runChains must reproduce the
 * distribution's analytic mean and variance within 4 Monte Carlo standard errors
 * (fixed seed). MCSE of a mean is sd/√ESS (@apsis/diagnostics mcseOfMean, or batch
 * means when that build is not available; see support/modelMcse.ts); the
 * variance is the mean of the squared deviations, whose MCSE is computed the same way.
 * This exercises the whole chain: bijection, log-Jacobian, prior density and gradient.
 */

interface Case {
  readonly label: string;
  readonly declaration: ParameterDeclaration;
  readonly mean: number;
  readonly variance: number;
  readonly source: string;
}

const SQ2PI = Math.sqrt(2 * Math.PI);
const phi = (z: number): number => Math.exp(-0.5 * z * z) / SQ2PI;
// Φ(1/3) and Φ(−1) for the truncated normal on [−1, 2] with mean 0.5, sd 1.5: α = −1, β = 1.
// Φ(1) = 0.8413447460685429 (Abramowitz & Stegun 1964, Table 26.1; from memory).
const Z = 2 * 0.8413447460685429 - 1;

const cases: Case[] = [
  { label: 'normal(1, 2)', declaration: { name: 'p', prior: priors.normal(1, 2) }, mean: 1, variance: 4, source: 'common practice' },
  {
    label: 'halfNormal(2) on positive',
    declaration: { name: 'p', support: supports.positive(), prior: priors.halfNormal(2) },
    mean: 2 * Math.sqrt(2 / Math.PI),
    variance: 4 * (1 - 2 / Math.PI),
    source: 'common practice',
  },
  {
    label: 'studentT(8, −1, 0.5)',
    declaration: { name: 'p', prior: priors.studentT(8, -1, 0.5) },
    mean: -1,
    variance: 0.25 * (8 / 6),
    source: 'variance s² ν/(ν − 2), common practice',
  },
  {
    label: 'uniform(−2, 6) on interval(−2, 6)',
    declaration: { name: 'p', support: supports.interval(-2, 6) },
    mean: 2,
    variance: 64 / 12,
    source: 'common practice',
  },
  {
    label: 'logUniform(0.1, 100) on interval(0.1, 100)',
    declaration: { name: 'p', support: supports.interval(0.1, 100), prior: priors.logUniform(0.1, 100) },
    mean: 99.9 / Math.log(1000),
    variance: (1e4 - 0.01) / (2 * Math.log(1000)) - (99.9 / Math.log(1000)) ** 2,
    source: 'direct integration of x/(x ln(b/a)) and x²/(x ln(b/a))',
  },
  {
    label: 'logNormal(0.3, 0.4) on positive',
    declaration: { name: 'p', support: supports.positive(), prior: priors.logNormal(0.3, 0.4) },
    mean: Math.exp(0.3 + 0.08),
    variance: (Math.exp(0.16) - 1) * Math.exp(0.6 + 0.16),
    source: 'common practice',
  },
  {
    label: 'exponential(2.5) on positive',
    declaration: { name: 'p', support: supports.positive(), prior: priors.exponential(2.5) },
    mean: 0.4,
    variance: 0.16,
    source: 'common practice',
  },
  {
    label: 'gamma(3, 2) on positive',
    declaration: { name: 'p', support: supports.positive(), prior: priors.gamma(3, 2) },
    mean: 1.5,
    variance: 0.75,
    source: 'mean α/β, variance α/β², common practice',
  },
  {
    label: 'inverseGamma(6, 2) on positive',
    declaration: { name: 'p', support: supports.positive(), prior: priors.inverseGamma(6, 2) },
    mean: 2 / 5,
    variance: 4 / (25 * 4),
    source: 'mean β/(α − 1), variance β²/((α − 1)²(α − 2)), common practice',
  },
  {
    label: 'beta(2, 3) on unitInterval',
    declaration: { name: 'p', support: supports.unitInterval(), prior: priors.beta(2, 3) },
    mean: 0.4,
    variance: 0.04,
    source: 'common practice',
  },
  {
    label: 'beta(0.5, 0.5) on unitInterval',
    declaration: { name: 'p', support: supports.unitInterval(), prior: priors.beta(0.5, 0.5) },
    mean: 0.5,
    variance: 0.125,
    source: 'arcsine law, common practice',
  },
  {
    label: 'truncatedNormal(0.5, 1.5, −1, 2) on interval(−1, 2)',
    declaration: { name: 'p', support: supports.interval(-1, 2), prior: priors.truncatedNormal(0.5, 1.5, -1, 2) },
    // α = −1, β = 1: symmetric, so the mean is 0.5 and Var = σ²(1 − 2φ(1)/Z)
    // (Johnson, Kotz & Balakrishnan 1994, ch. 13; from memory).
    mean: 0.5,
    variance: 2.25 * (1 - (2 * phi(1)) / Z),
    source: 'Johnson, Kotz & Balakrishnan (1994)',
  },
  {
    label: 'gamma(2, 1) on lowerBounded(0) (same as positive)',
    declaration: { name: 'p', support: supports.lowerBounded(0), prior: priors.gamma(2, 1) },
    mean: 2,
    variance: 2,
    source: 'common practice',
  },
];

const settings = { chains: 4, warmup: 400, draws: 1000, seed: 20260 } as const;

function column(values: Float64Array[], stride: number, k: number, f: (v: number) => number = (v) => v): Float64Array[] {
  return values.map((chain) => {
    const n = chain.length / stride;
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = f(chain[i * stride + k]);
    return out;
  });
}

function pooledMean(chains: Float64Array[]): number {
  let s = 0;
  let n = 0;
  for (const c of chains) for (const v of c) (s += v), n++;
  return s / n;
}

function expectMoments(chains: Float64Array[], mean: number, variance: number): void {
  const m = pooledMean(chains);
  expect(Math.abs(m - mean)).toBeLessThan(4 * mcseOfMean(chains));
  const sq = chains.map((c) => c.map((v) => (v - m) ** 2));
  expect(Math.abs(pooledMean(sq) - variance)).toBeLessThan(4 * mcseOfMean(sq));
}

describe('sampling priors alone through runChains (NUTS)', () => {
  for (const c of cases) {
    it(`${c.label}: mean and variance within 4 MCSE (${c.source})`, async () => {
      const model = await compileModel({ parameters: [c.declaration] });
      const result = await runChains(model, settings);
      expect(result.outputs?.names).toEqual(['p']);
      expectMoments(column(result.outputs!.values, 1, 0), c.mean, c.variance);
    });
  }

  it('Cauchy(2, 3) and halfCauchy(1.5): half the mass within one scale of the centre (4 MCSE)', async () => {
    const model = await compileModel({
      parameters: [
        { name: 'c', prior: priors.cauchy(2, 3) },
        { name: 'h', support: supports.positive(), prior: priors.halfCauchy(1.5) },
      ],
    });
    const result = await runChains(model, settings);
    const inC = column(result.outputs!.values, 2, 0, (v) => (Math.abs(v - 2) < 3 ? 1 : 0));
    const inH = column(result.outputs!.values, 2, 1, (v) => (v < 1.5 ? 1 : 0));
    // P(|X − m| < s) = 2 atan(1)/π = 1/2 (Cauchy distribution function, common practice).
    expect(Math.abs(pooledMean(inC) - 0.5)).toBeLessThan(4 * mcseOfMean(inC));
    expect(Math.abs(pooledMean(inH) - 0.5)).toBeLessThan(4 * mcseOfMean(inH));
  });

  it('ordered pair of N(0, 1): the larger has mean 1/√π and variance 1 − 1/π', async () => {
    // Order statistics of two standard normals: E max = 1/√π, E max² = 1 (common practice).
    const model = await compileModel({ parameters: [{ name: 'v', size: 2, support: supports.ordered(), prior: priors.normal(0, 1) }] });
    const result = await runChains(model, settings);
    expectMoments(column(result.outputs!.values, 2, 1), 1 / Math.sqrt(Math.PI), 1 - 1 / Math.PI);
    expectMoments(column(result.outputs!.values, 2, 0), -1 / Math.sqrt(Math.PI), 1 - 1 / Math.PI);
  });

  it('simplex of 3 with dirichlet([2, 3, 4]): component means α/Σα and variances m(1 − m)/(Σα + 1)', async () => {
    const model = await compileModel({ parameters: [{ name: 'w', size: 3, support: supports.simplex(), prior: priors.dirichlet([2, 3, 4]) }] });
    const result = await runChains(model, settings);
    [2, 3, 4].forEach((a, k) => {
      const m = a / 9;
      expectMoments(column(result.outputs!.values, 3, k), m, (m * (1 - m)) / 10);
    });
  });

  it('angle with the circular uniform prior: E cos θ = 0, E cos² θ = ½ (common practice)', async () => {
    const model = await compileModel({ parameters: [{ name: 'w', support: supports.angle() }] });
    const result = await runChains(model, settings);
    const cos = column(result.outputs!.values, 1, 0, Math.cos);
    const sin = column(result.outputs!.values, 1, 0, Math.sin);
    // Var cos θ = E cos² θ = ½ under the uniform law.
    expectMoments(cos, 0, 0.5);
    expectMoments(sin, 0, 0.5);
  });
});

import { describe, expect, it } from 'vitest';
import { energyBfmi, SamplerStatsError, OptionError, samplerHealth } from '../src/index.js';
import { ar1Chain, createRandom } from './support/random.js';

describe('E-BFMI (Betancourt 2016, arXiv:1604.00695)', () => {
  it('closed form on small series: sum of squared steps over sum of squared deviations', () => {
    // [1, 2, 3, 4]: steps 1, 1, 1 -> 3; deviations -1.5, -0.5, 0.5, 1.5 -> 5; E-BFMI = 3/5
    expect(energyBfmi([1, 2, 3, 4])).toBeCloseTo(0.6, 15);
    // [0, 1, 0, 1]: steps 1, 1, 1 -> 3; deviations ±0.5 -> 1; E-BFMI = 3
    expect(energyBfmi([0, 1, 0, 1])).toBeCloseTo(3, 15);
    expect(energyBfmi([5, 5, 5])).toBeNaN();
    expect(energyBfmi([5])).toBeNaN();
  });

  it('for an AR(1) energy series it tends to 2 (1 - phi): E(E_n - E_{n-1})^2 = 2 var (1 - phi) (calculus)', () => {
    // relative sd of the estimator at N = 1e5, from a 30-replication pilot: 0.3% (phi 0),
    // 1.1% (0.8), 1.8% (0.95); 8% is at least 4.4 sd
    const rng = createRandom(41);
    for (const phi of [0, 0.8, 0.95]) {
      const energy = ar1Chain(rng, 100_000, phi).map((v) => 50 + 3 * v);
      expect(Math.abs(energyBfmi(energy) / (2 * (1 - phi)) - 1)).toBeLessThan(0.08);
    }
  });
});

describe('sampler health', () => {
  const stats = [
    {
      stepSize: new Float64Array([0.5, 0.5, 0.5, 0.5]),
      treeDepth: new Float64Array([3, 10, 10, 2]),
      leapfrogSteps: new Float64Array([7, 1023, 1023, 3]),
      divergent: new Uint8Array([0, 1, 0, 0]),
      energy: new Float64Array([1, 2, 3, 4]),
      acceptance: new Float64Array([0.9, 0.1, 0.8, 0.6]),
    },
    {
      stepSize: [0.25, 0.25, 0.25, 0.25],
      treeDepth: [3, 3, 3, 4],
      divergent: [false, false, false, false],
      energy: [0, 1, 0, 1],
      acceptance: [1, 1, 1, 1],
    },
  ];

  it('counts divergences, tree-depth hits and their shares per chain; step size and acceptance means', () => {
    const h = samplerHealth(stats, { maxTreeDepth: 10 });
    expect(h.totalDraws).toBe(8);
    expect(h.totalDivergences).toBe(1);
    expect(h.chains[0]).toMatchObject({ divergences: 1, divergenceFraction: 0.25, treeDepthHits: 2, treeDepthShare: 0.5, stepSize: 0.5, meanLeapfrogSteps: 514 });
    expect(h.chains[0].meanAcceptance).toBeCloseTo(0.6, 15);
    expect(h.chains[0].ebfmi).toBeCloseTo(0.6, 15);
    expect(h.chains[1]).toMatchObject({ divergences: 0, treeDepthHits: 0, stepSize: 0.25, meanAcceptance: 1, meanLeapfrogSteps: null });
    expect(h.chains[1].ebfmi).toBeCloseTo(3, 15);
  });

  it('leaves figures null when their statistic or the maximum depth is missing', () => {
    const h = samplerHealth([{ energy: [1, 3, 2, 5] }]);
    expect(h.totalDivergences).toBeNull();
    expect(h.chains[0].treeDepthShare).toBeNull();
    expect(h.chains[0].stepSize).toBeNull();
    expect(h.chains[0].ebfmi).not.toBeNull();
  });

  it('rejects columns of unequal length, non-finite values, bad divergence flags and a bad maximum depth, naming the field', () => {
    expect(() => samplerHealth([{ energy: [1, 2, 3], divergent: [0, 1] }])).toThrow(SamplerStatsError);
    expect(() => samplerHealth([{ energy: [1, 2, 3], divergent: [0, 1] }])).toThrow(/stats\[0\]\.energy: expected 2 entries \(as many as stats\[0\]\.divergent\), got 3/);
    expect(() => samplerHealth([{ energy: [1, Number.NaN] }])).toThrow(/stats\[0\]\.energy\[1\]: expected a finite number, got NaN/);
    expect(() => samplerHealth([{ divergent: [0, 2] }])).toThrow(/stats\[0\]\.divergent\[1\]: expected true\/false or 0\/1, got 2/);
    expect(() => samplerHealth([{ energy: 'high' as unknown as number[] }])).toThrow(/stats\[0\]\.energy/);
    expect(() => samplerHealth([])).toThrow(/at least one chain/);
    expect(() => samplerHealth([{ treeDepth: [1] }], { maxTreeDepth: 0 })).toThrow(OptionError);
  });
});

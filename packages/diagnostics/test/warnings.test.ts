import { describe, expect, it } from 'vitest';
import { convergenceVerdict, convergenceWarnings, formatVerdict, formatWarnings, OptionError, samplerHealth, summarize } from '../src/index.js';
import { ar1Chain, chainsOf, createRandom, normalDraws } from './support/random.js';

const rng = createRandom(61);
const healthyStats = chainsOf(4, () => normalDraws(rng, 2000)).map((e) => ({
  energy: e,
  divergent: new Uint8Array(2000),
  treeDepth: new Float64Array(2000).fill(3),
  stepSize: new Float64Array(2000).fill(0.4),
}));

describe('warnings and verdict', () => {
  it('independent chains and healthy statistics: converged, no warnings', () => {
    const summary = summarize({ a: chainsOf(4, () => normalDraws(rng, 1000)), b: chainsOf(4, () => normalDraws(rng, 1000)) });
    const verdict = convergenceVerdict(summary, samplerHealth(healthyStats, { maxTreeDepth: 10 }));
    expect(verdict.converged).toBe(true);
    expect(verdict.warnings).toEqual([]);
    expect(formatVerdict(verdict)).toMatch(/^Converged: yes/);
    expect(formatVerdict(verdict)).toMatch(/cannot prove convergence/);
    expect(formatWarnings(verdict.warnings)).toBe('No warnings.\n');
  });

  it('R-hat above 1.01 and ESS below 100 per chain are problems, with value, threshold, message and advice', () => {
    // one chain shifted by 2 sd: R-hat ~1.3, and the between-chain spread cuts the ESS
    const summary = summarize({ shifted: chainsOf(4, (c) => ar1Chain(rng, 500, 0.9).map((v) => v + (c === 0 ? 2 : 0))) });
    const warnings = convergenceWarnings(summary);
    const codes = warnings.map((w) => w.code);
    expect(codes).toContain('rhat-high');
    expect(codes).toContain('bulk-ess-low');
    const rhat = warnings.find((w) => w.code === 'rhat-high')!;
    expect(rhat).toMatchObject({ severity: 'problem', quantity: 'shifted', threshold: 1.01 });
    expect(rhat.value).toBe(summary.rows[0].rhat);
    expect(rhat.message).toMatch(/R-hat of 'shifted' is 1\.\d{3}, above 1\.01/);
    expect(rhat.advice).toMatch(/longer/);
    const ess = warnings.find((w) => w.code === 'bulk-ess-low')!;
    expect(ess.threshold).toBe(400); // 100 per chain x 4 chains (Vehtari et al. 2021)
    const verdict = convergenceVerdict(summary);
    expect(verdict.converged).toBe(false);
    expect(verdict.reasons).toContain(rhat.message);
    expect(formatVerdict(verdict)).toMatch(/^Converged: no\n {2}- R-hat of 'shifted'/);
    expect(formatWarnings(warnings)).toMatch(/Problem: R-hat of 'shifted'.*\n {2}What to do: /);
  });

  it('tail-ESS alone can fail: slowly mixing tails with a well-resolved bulk', () => {
    const summary = summarize({ x: chainsOf(4, () => ar1Chain(rng, 1000, 0.5)) });
    const w = convergenceWarnings(summary, null, { essPerChain: summary.rows[0].tailEss! / 4 + 1 });
    expect(w.map((x) => x.code)).toContain('tail-ess-low');
  });

  it('divergences and low E-BFMI are problems; tree-depth saturation is a caution that fails only in strict mode', () => {
    const summary = summarize({ a: chainsOf(4, () => normalDraws(rng, 1000)) });
    const divergent = new Uint8Array(2000);
    divergent[17] = 1;
    const sticky = ar1Chain(rng, 2000, 0.95); // E-BFMI about 2 (1 - 0.95) = 0.1
    const saturated = new Float64Array(2000).fill(3);
    saturated.fill(10, 0, 100);
    const stats = [
      { ...healthyStats[0], divergent },
      { ...healthyStats[1], energy: sticky },
      { ...healthyStats[2], treeDepth: saturated },
      healthyStats[3],
    ];
    const health = samplerHealth(stats, { maxTreeDepth: 10 });
    const warnings = convergenceWarnings(summary, health);
    expect(warnings.map((w) => [w.code, w.chain])).toEqual([
      ['divergences', null],
      ['ebfmi-low', 1],
      ['tree-depth-saturated', 2],
    ]);
    expect(warnings[0].message).toMatch(/^1 of 8000 draws ended in a divergent trajectory \(chain 0: 1, chain 1: 0/);
    expect(warnings[1].value).toBeLessThan(0.3);
    expect(warnings[2]).toMatchObject({ severity: 'caution', value: 0.05 });
    expect(convergenceVerdict(summary, health).converged).toBe(false);
    const onlyDepth = samplerHealth([{ ...healthyStats[0], treeDepth: saturated }], { maxTreeDepth: 10 });
    expect(convergenceVerdict(summary, onlyDepth).converged).toBe(true);
    expect(convergenceVerdict(summary, onlyDepth, { strict: true }).converged).toBe(false);
  });

  it('a constant quantity is a caution, chains stuck at different values a problem', () => {
    const summary = summarize({ fixed: chainsOf(2, () => new Float64Array(20).fill(1)), stuck: chainsOf(2, (c) => new Float64Array(20).fill(c)) });
    const w = convergenceWarnings(summary);
    expect(w.map((x) => [x.code, x.severity])).toEqual([
      ['rhat-undefined', 'caution'],
      ['rhat-infinite', 'problem'],
    ]);
  });

  it('thresholds can be changed and are validated', () => {
    const summary = summarize({ a: chainsOf(4, () => ar1Chain(rng, 1000, 0.3)) });
    expect(convergenceWarnings(summary, null, { rhat: 1.0000001 }).some((w) => w.code === 'rhat-high')).toBe(true);
    expect(() => convergenceWarnings(summary, null, { rhat: 0.9 })).toThrow(OptionError);
    expect(() => convergenceWarnings(summary, null, { rhat: 0.9 })).toThrow(/thresholds\.rhat: .*got 0\.9/);
  });
});

import { describe, expect, it } from 'vitest';
import { runChains, type RunResult } from '../src/sampler/index.js';
import type { Target } from '../src/target.js';
import { column, meanWithMcse, varianceWithMcse } from './support/mcse.js';
import { standardNormal } from './support/targets.js';

/** Every coordinate's mean within 4 MCSE of 0 and variance within 4 MCSE of 1. */
function expectStandardNormal(r: RunResult, dim: number): void {
  for (let j = 0; j < dim; j++) {
    const xs = r.draws.map((d) => column(d, dim, j));
    const m = meanWithMcse(xs);
    const v = varianceWithMcse(xs, 0);
    expect(Math.abs(m.mean), `mean of x[${j}]`).toBeLessThan(4 * m.mcse);
    expect(Math.abs(v.variance - 1), `variance of x[${j}]`).toBeLessThan(4 * v.mcse);
  }
}

function divergences(r: RunResult): number {
  return r.stats.reduce((s, st) => s + st.divergent.reduce((a, b) => a + b, 0), 0);
}

// Standard normal: mean 0 and variance 1 in every coordinate (analytic). Tolerance:
// 4 Monte Carlo standard errors, MCSE from a multi-chain ESS (see support/mcse.ts).
describe('NUTS on a standard normal', () => {
  it('1-D: moments within 4 MCSE, no divergences', async () => {
    const r = await runChains(standardNormal(1), { seed: 101 });
    expectStandardNormal(r, 1);
    expect(divergences(r)).toBe(0);
  });

  it('100-D: moments within 4 MCSE in every coordinate, no divergences', async () => {
    const r = await runChains(standardNormal(100), { seed: 102 });
    expectStandardNormal(r, 100);
    expect(divergences(r)).toBe(0);
    // With an adapted metric near the identity, trees stay far from the depth limit.
    for (const st of r.stats) expect(Math.max(...st.treeDepth)).toBeLessThan(10);
  });

  it('acceptance statistic settles near the 0.8 target and stats columns are filled', async () => {
    const r = await runChains(standardNormal(10), { seed: 103, chains: 2 });
    for (const st of r.stats) {
      const mean = st.acceptance.reduce((a, b) => a + b, 0) / st.acceptance.length;
      // Dual averaging matches the target during warmup; with the averaged step size
      // the acceptance during sampling is typically a bit higher (common practice).
      expect(mean).toBeGreaterThan(0.7);
      expect(mean).toBeLessThan(0.97);
      for (let i = 0; i < st.stepSize.length; i++) {
        expect(st.leapfrogSteps[i]).toBeGreaterThanOrEqual(1);
        expect(st.leapfrogSteps[i]).toBeLessThanOrEqual(2 ** st.treeDepth[i] - 1);
      }
      // energy − (−logDensity) is the kinetic energy, which is ≥ 0.
      for (let i = 0; i < st.energy.length; i++) expect(st.energy[i] + st.logDensity[i]).toBeGreaterThanOrEqual(0);
    }
  });
});

describe('static HMC on a standard normal', () => {
  it('10-D with jitter: moments within 4 MCSE', async () => {
    const r = await runChains(standardNormal(10), { seed: 104, method: 'hmc', pathLength: 2, jitter: 0.3 });
    expectStandardNormal(r, 10);
    expect(divergences(r)).toBe(0);
    for (const st of r.stats) expect(st.treeDepth.every((d) => d === 0)).toBe(true);
  });
});

describe('robustness', () => {
  it('a region of NaN log-density counts as divergences, never a crash', async () => {
    // Standard normal truncated by a NaN wall at x0 > 1: the sampler must stay finite
    // and below the wall, and report the wall hits as divergent transitions.
    const walled: Target = {
      dim: 2,
      logDensityGrad(x, g) {
        g[0] = -x[0];
        g[1] = -x[1];
        return x[0] > 1 ? Number.NaN : -0.5 * (x[0] * x[0] + x[1] * x[1]);
      },
    };
    const r = await runChains(walled, { seed: 105, chains: 2, warmup: 300, draws: 300 });
    expect(r.divergences.reduce((a, b) => a + b, 0)).toBeGreaterThan(0);
    for (const d of r.draws) for (let i = 0; i < d.length; i += 2) expect(d[i]).toBeLessThanOrEqual(1);
    for (const st of r.stats) for (const lp of st.logDensity) expect(Number.isFinite(lp)).toBe(true);
  });

  it('reports progress, keeps warmup on request and honours an abort signal', async () => {
    const seen: number[] = [];
    const r = await runChains(standardNormal(3), {
      seed: 106,
      chains: 2,
      warmup: 120,
      draws: 80,
      keepWarmup: true,
      onProgress: (p) => {
        if (p.chain === 1) seen.push(p.iteration);
        expect(p.total).toBe(200);
      },
    });
    // Progress at least every 50 iterations (slices also end after 100 ms), ending at the total.
    expect(seen[seen.length - 1]).toBe(200);
    for (let k = 0; k < seen.length; k++) expect(seen[k] - (k > 0 ? seen[k - 1] : 0)).toBeGreaterThan(0);
    for (let k = 0; k < seen.length; k++) expect(seen[k] - (k > 0 ? seen[k - 1] : 0)).toBeLessThanOrEqual(50);
    expect(r.warmup!.draws[0].length).toBe(120 * 3);
    expect(r.warmup!.stats[1].stepSize.length).toBe(120);
    expect(r.draws[0].length).toBe(80 * 3);
    const controller = new AbortController();
    const p = runChains(standardNormal(3), {
      seed: 107,
      chains: 1,
      warmup: 10000,
      draws: 10000,
      signal: controller.signal,
      onProgress: (q) => {
        if (q.iteration >= 100) controller.abort(new Error('stopped by test'));
      },
    });
    await expect(p).rejects.toThrow('stopped by test');
  });

  it('records target outputs and names beside the draws', async () => {
    const base = standardNormal(2);
    const target: Target = {
      ...base,
      names: ['a', 'b'],
      outputs: {
        names: ['expA', 'sum'],
        write(x, out) {
          out[0] = Math.exp(x[0]);
          out[1] = x[0] + x[1];
        },
      },
    };
    const r = await runChains(target, { seed: 108, chains: 2, warmup: 50, draws: 30 });
    expect(r.names).toEqual(['a', 'b']);
    expect(r.outputs!.names).toEqual(['expA', 'sum']);
    const d = r.draws[1];
    const o = r.outputs!.values[1];
    for (let i = 0; i < 30; i++) {
      expect(o[2 * i]).toBe(Math.exp(d[2 * i]));
      expect(o[2 * i + 1]).toBe(d[2 * i] + d[2 * i + 1]);
    }
  });
});

import { bulkEss, splitRhat, tailEss } from '@apsis/diagnostics';
import { describe, expect, it } from 'vitest';
import { assessConvergence, checkPoints, executeRun, resolveConvergenceCriteria, RunOptionsError } from '../src/runner/index.js';
import { bimodal, gaussian } from './fixtures/targets.js';

/** Column j of each chain's row-major draws. */
const column = (draws: Float64Array[], width: number, j: number): Float64Array[] =>
  draws.map((d) => Float64Array.from({ length: d.length / width }, (_, i) => d[i * width + j]));

describe('run until converged', () => {
  it('checks on a fixed schedule: first check, then +max(minBlock, ceil(growth × draws)), ending at the cap', () => {
    // Hand-computed: 100 → +50 … → 500 → +50 → 550 → +55 → 605 → +61 → 666 → +67 → 733 → cap 750.
    const c = resolveConvergenceCriteria({ firstCheck: 100, growth: 0.1, minBlock: 50, maxDraws: 750 });
    expect(checkPoints(c)).toEqual([100, 150, 200, 250, 300, 350, 400, 450, 500, 550, 605, 666, 733, 750]);
    expect(checkPoints(resolveConvergenceCriteria({ firstCheck: 8, maxDraws: 8 }))).toEqual([8]);
  });

  it('stops at the first check where every quantity meets the criteria, on a well-behaved target', async () => {
    // Criteria: R-hat < 1.01 and bulk/tail ESS ≥ target (Vehtari et al. 2021, Bayesian Analysis 16, 667).
    const criteria = { minBulkEss: 300, minTailEss: 300, firstCheck: 50, maxDraws: 5000 };
    const run = await executeRun(gaussian({ dim: 2 }), { chains: 4, warmup: 200, seed: 5, untilConverged: criteria, progress: false });
    expect(run.stop.reason).toBe('converged');
    const kept = run.stop.drawsPerChain;
    expect(kept).toBeLessThan(5000);
    expect(run.draws[0].length).toBe(kept * 2);
    expect(run.settings.draws).toBe(kept);
    // Recomputed independently of the runner from the returned outputs (radius, x0²).
    for (let j = 0; j < 2; j++) {
      const chains = column(run.outputs!.values, 2, j);
      expect(splitRhat(chains)).toBeLessThan(1.01);
      expect(bulkEss(chains)).toBeGreaterThanOrEqual(300);
      expect(tailEss(chains)).toBeGreaterThanOrEqual(300);
    }
    // Not one check too late: at the previous check point the criteria were not met.
    const points = checkPoints(resolveConvergenceCriteria(criteria));
    const previous = points[points.indexOf(kept) - 1];
    if (previous !== undefined) {
      const named = ['radius', 'x0_squared'].map((name, j) => ({ name, chains: column(run.outputs!.values, 2, j).map((c) => c.subarray(0, previous)) }));
      expect(assessConvergence(named, resolveConvergenceCriteria(criteria)).converged).toBe(false);
    }
    // The draws are the first `kept` draws of a fixed-length run with the same seed.
    const fixed = await executeRun(gaussian({ dim: 2 }), { chains: 4, warmup: 200, seed: 5, draws: kept, progress: false });
    expect(fixed.draws).toEqual(run.draws);
  });

  it('does not stop early when chains sit in separated modes: it runs to the draw cap and says why', async () => {
    // Modes at ±6 with unit sd: the density midway is e^-18 ≈ 1.5e-8 of the peaks, so a
    // chain started in one mode stays there (analytic); R-hat then stays far above 1.
    const run = await executeRun(bimodal({ gap: 12, dim: 2 }), {
      chains: 2,
      warmup: 100,
      seed: 9,
      init: [
        [-6, 0],
        [6, 0],
      ],
      untilConverged: { firstCheck: 100, maxDraws: 400, minBulkEss: 100, minTailEss: 100 },
      progress: false,
    });
    expect(run.stop.reason).toBe('draw-cap');
    expect(run.stop.drawsPerChain).toBe(400);
    expect(run.stop.message).toMatch(/not converged: stopped at the draw cap of 400/);
    expect(run.stop.failures[0]).toMatch(/^x\[0\]: R-hat \d+\.\d+ \(needs < 1\.01\)/);
    expect(splitRhat(column(run.draws, 2, 0))).toBeGreaterThan(1.5);
    expect(run.convergence?.converged).toBe(false);
  });

  it('stops at the time cap, checked at each check', async () => {
    const run = await executeRun(bimodal({ gap: 12 }), {
      chains: 2,
      warmup: 50,
      seed: 3,
      init: [
        [-6, 0],
        [6, 0],
      ],
      untilConverged: { firstCheck: 20, minBlock: 20, maxDraws: 1e6, maxSeconds: 0.05 },
      progress: false,
    });
    expect(run.stop.reason).toBe('time-cap');
    expect(run.stop.message).toMatch(/time cap of 0\.05 s/);
  });

  it('validates the criteria and their combination with other options', async () => {
    await expect(executeRun(gaussian(null), { draws: 100, untilConverged: true })).rejects.toThrow(/`draws` = 100 and `untilConverged` exclude each other/);
    await expect(executeRun(gaussian(null), { untilConverged: { rhatBelow: 0.9 } })).rejects.toThrow(/`untilConverged.rhatBelow` = 0.9: expected a number > 1/);
    await expect(executeRun(gaussian(null), { untilConverged: { patience: 3 } as never })).rejects.toThrow(RunOptionsError);
    await expect(
      executeRun(gaussian(null), { chains: 2, warmup: 20, untilConverged: { quantities: ['nothing'], firstCheck: 10, maxDraws: 20 }, progress: false }),
    ).rejects.toThrow(/no quantity named "nothing"; known: radius, x0_squared, x\[0\], x\[1\]/);
  });
});

/**
 * The full demo run (the settings of `pnpm demo`), under APSIS_FULL=1: the sampler must
 * pass every convergence check (rank-normalised split R-hat below 1.01 and bulk and
 * tail ESS of at least 100 per chain, Vehtari et al. 2021; no divergent transitions,
 * Betancourt 2017) and recover the invented system: the true value of every quantity
 * in the printed table lies inside its central 99% posterior interval.
 *
 * About that tolerance: for a calibrated posterior each true value misses its 99%
 * interval with probability 1%. The 36 quantities of the table are far from
 * independent (most derived quantities follow from a few parameters), so the chance
 * that a correct sampler misses at least once lies between 1% and 36% (the union
 * bound); the data and the run have fixed seeds, so the outcome is reproducible. The short variant of
 * this check runs always in tests/demo-smoke.test.ts.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../examples/demo.js';
import { centralInterval, demoSections } from '../examples/demo/parameterTable.js';

describe.runIf(process.env.APSIS_FULL === '1')('full demo run', () => {
  let dir = '';
  afterAll(() => {
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('converges by every check and recovers the true values inside 99% intervals', async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'apsis-demo-full-'));
    const result = await main({ quiet: true, outDir: path.join(dir, 'report'), runDir: path.join(dir, 'run') });

    expect(result.run.divergences.reduce((a, b) => a + b, 0)).toBe(0);
    const rhats = result.summary.rows.map((r) => r.rhat ?? Infinity);
    expect(Math.max(...rhats)).toBeLessThan(1.01);
    expect(result.verdict.reasons).toEqual([]);
    expect(result.verdict.converged).toBe(true);

    const rows = new Map(result.summary.rows.map((r) => [r.name, r]));
    const misses: string[] = [];
    const columns = demoSections(0).flatMap((s) => s.rows.map((r) => r.column));
    expect(columns.length).toBeGreaterThan(30);
    for (const column of columns) {
      const row = rows.get(column);
      expect(row, column).toBeDefined();
      const [low, high] = centralInterval(row!, 0.99);
      const truth = result.truth[column];
      if (!(truth >= low && truth <= high)) misses.push(`${column}: true ${truth} outside [${low}, ${high}]`);
    }
    expect(misses).toEqual([]);
  }, 900_000);
});

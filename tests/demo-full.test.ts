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
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { main } from '../examples/demo.js';
import { centralInterval, demoSections } from '../examples/demo/parameterTable.js';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** The text blocks of docs/*.md marked as demo output, with their non-blank lines. */
function demoOutputBlocks(): { where: string; lines: string[] }[] {
  const out: { where: string; lines: string[] }[] = [];
  for (const page of readdirSync(path.join(root, 'docs')).filter((f) => f.endsWith('.md'))) {
    const lines = readFileSync(path.join(root, 'docs', page), 'utf8').split('\n');
    lines.forEach((l, i) => {
      if (l.trim() !== '<!-- sample: demo-output -->') return;
      const indent = /^\s*/.exec(lines[i + 1])![0];
      const body: string[] = [];
      for (let j = i + 2; j < lines.length && lines[j].trim() !== '```'; j++) if (lines[j].trim() !== '') body.push(lines[j].slice(indent.length).trimEnd());
      out.push({ where: `docs/${page}:${i + 2}`, lines: body });
    });
  }
  return out;
}

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

    // The demo output quoted in the docs (blocks marked <!-- sample: demo-output -->) is
    // what this run printed, line for line.
    const printed = new Set(result.text.split('\n').map((l) => l.trimEnd()));
    const quoted = demoOutputBlocks();
    expect(quoted.length).toBeGreaterThan(0);
    for (const { where, lines } of quoted) {
      for (const line of lines) expect(printed.has(line), `${where}: "${line}"`).toBe(true);
    }
    // docs/convergence.md quotes the period's mean, sd and MC error from `apsis summary runs/demo`.
    const period = rows.get('period_b')!;
    const convergence = readFileSync(path.join(root, 'docs/convergence.md'), 'utf8');
    const quotedPeriod = /period of ([\d.]+) d with a posterior sd of\s+([\d.]+) d and an MC error of ([\d.]+) d/.exec(convergence);
    expect(quotedPeriod).not.toBeNull();
    expect(quotedPeriod![1]).toBe(period.mean.toFixed(5));
    expect(quotedPeriod![2]).toBe(period.sd.toPrecision(3));
    expect(Number(quotedPeriod![3])).toBe(Number(period.mcseMean!.toPrecision(2)));
  }, 900_000);
});

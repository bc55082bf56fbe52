import { readFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { QuantitySummary } from '@apsis/diagnostics';
import { describe, expect, it } from 'vitest';
import * as jointFit from '../examples/joint-fit.js';
import * as rvFit from '../examples/rv-fit.js';
import * as transitFit from '../examples/transit-fit.js';

/**
 * The builder tutorials (docs/fitting-radial-velocities.md, docs/fitting-transits.md,
 * docs/joint-fit.md) show their programs verbatim, and the programs run: with short
 * chains here, checking that the fit lands on the simulated truth where even a short run
 * must (period and mid-transit time inside the central 99% interval; fixed seeds) and
 * that panels for the report come out. The full-size runs are the programs' defaults.
 */
const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

function expectVerbatim(doc: string, example: string): void {
  const text = readFileSync(path.join(root, doc), 'utf8');
  const source = readFileSync(path.join(root, example), 'utf8');
  const blocks = [...text.matchAll(/```ts\n([\s\S]*?)```/g)].map((m) => m[1]);
  expect(blocks.at(-1)).toBe(source);
  // Excerpts in the text are lines of the program.
  for (const excerpt of blocks.slice(0, -1)) {
    for (const line of excerpt.split('\n').filter((l) => l.trim().length > 0 && !l.trim().startsWith('//'))) {
      expect(source, `${doc}: "${line.trim()}"`).toContain(line.trim());
    }
  }
}

/** `value` lies inside the central 99% interval (the summaries' two quantiles, 0.5% and 99.5%). */
function inside(summary: readonly QuantitySummary[], name: string, value: number): void {
  const s = summary.find((x) => x.name === name);
  expect(s, name).toBeDefined();
  expect(s!.quantiles.map((q) => q.probability)).toEqual([0.005, 0.995]);
  expect(s!.quantiles[0].value, name).toBeLessThan(value);
  expect(s!.quantiles[1].value, name).toBeGreaterThan(value);
}

describe('builder tutorials', () => {
  it('radial velocities: the program runs and recovers both orbits', async () => {
    const { summary, panels, epoch, divergences } = await rvFit.main({ points: 60, chains: 2, warmup: 200, draws: 200, quiet: true });
    expect(divergences).toBe(0);
    for (const p of rvFit.truth.planets) {
      inside(summary, `period_${p.label}`, p.period);
      inside(summary, `semiAmplitude_${p.label}`, p.semiAmplitude);
      const tc = p.tc - epoch;
      inside(summary, `tc_${p.label}`, tc - p.period * Math.round(tc / p.period));
    }
    expect(panels.map((p) => p.title)).toContain('Radial velocity of planet c, folded');
    expectVerbatim('docs/fitting-radial-velocities.md', 'examples/rv-fit.ts');
  });

  it('transits: the program runs and finds the transit', async () => {
    const { summary, panels } = await transitFit.main({ transits: 3, chains: 2, warmup: 80, draws: 80, quiet: true });
    inside(summary, 'period_b', transitFit.truth.planet.period);
    inside(summary, 'radiusRatio_b', transitFit.truth.planet.radiusRatio);
    expect(panels.map((p) => p.title)).toEqual(['Transit of planet b, light curve cam']);
    expectVerbatim('docs/fitting-transits.md', 'examples/transit-fit.ts');
  });

  it('joint: the program runs and recovers the shared orbit', async () => {
    // Warmup this short does not settle the step size; divergences are not judged here.
    const { summary, panels } = await jointFit.main({ points: 40, transits: 2, chains: 2, warmup: 80, draws: 80, quiet: true });
    inside(summary, 'period_b', jointFit.truth.b.period);
    inside(summary, 'semiAmplitude_b', jointFit.truth.b.semiAmplitude);
    inside(summary, 'radiusRatio_b', jointFit.truth.b.radiusRatio);
    expect(summary.map((s) => s.name)).toContain('planetMass_b');
    expect(panels).toHaveLength(4);
    expectVerbatim('docs/joint-fit.md', 'examples/joint-fit.ts');
  });
});

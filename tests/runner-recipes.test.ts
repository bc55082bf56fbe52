import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createRandomStream, executeRun, readRun, resumeRun } from '@apsis/core';
import { createRvModel, simulateRadialVelocities } from '@apsis/models';

// A run whose target comes from an apsis package can be resumed from the folder alone:
// the recipe names a trusted module (docs/long-runs.md). Reference: the same run,
// uninterrupted, with the model built in this thread (bit-identical draws, DESIGN.md).
const root = mkdtempSync(join(tmpdir(), 'apsis-recipes-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

function invented(): Record<string, unknown> {
  const stream = createRandomStream('runner recipe test');
  const times = Array.from({ length: 30 }, () => 2460100 + 120 * stream.uniform()).sort((a, b) => a - b);
  const { data } = simulateRadialVelocities(
    { times, instrument: 'spectrograph', errors: 2, planets: [{ period: 4.3, tc: 2460102.5, semiAmplitude: 30 }], offsets: { spectrograph: -3 } },
    stream,
  );
  const rv = Object.fromEntries(Object.entries(data).map(([k, v]) => [k, ArrayBuffer.isView(v) ? Array.from(v as Float64Array) : v]));
  return { rv, planets: [{ label: 'b', period: 4.3 }], star: { mass: 0.9, massUncertainty: 0.05 } };
}

describe('recipes naming an apsis package', () => {
  it('resume from the folder alone, with the draws of the uninterrupted run', async () => {
    const args = JSON.parse(JSON.stringify(invented())) as Record<string, unknown>;
    const recipe = { module: '@apsis/models', exportName: 'createRvModel', args: args as never };
    const options = { chains: 2, warmup: 120, draws: 60, seed: 21, checkpointEvery: 40, minCheckpointSeconds: 0, threads: 0, progress: false } as const;
    const folder = join(root, 'rv');
    const controller = new AbortController();
    await expect(
      executeRun(recipe, { ...options, folder, signal: controller.signal, onProgress: (p) => p.iteration >= 130 && controller.abort(new Error('cut')) }),
    ).rejects.toThrow('cut');
    const resumed = await resumeRun(folder, { threads: 0, progress: false });
    const reference = await executeRun(await createRvModel(args as never), options);
    expect(resumed.draws).toEqual(reference.draws);
    expect(resumed.outputs).toEqual(reference.outputs);
    expect(readRun(folder).outputs?.names).toContain('period_b');
  });
});

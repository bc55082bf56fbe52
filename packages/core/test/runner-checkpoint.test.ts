import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { CheckpointError, executeRun, readRun, resumeRun, TargetMismatchError, type ExecuteRunOptions } from '../src/runner/index.js';
import { gaussian } from './fixtures/targets.js';

// Reference: an uninterrupted run with the same seed. A resumed chain continues from
// its exact serialised state, so every draw must agree bit for bit (DESIGN.md).
const root = mkdtempSync(join(tmpdir(), 'apsis-checkpoint-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
let n = 0;
const fresh = (): string => join(root, `run-${n++}`);
const target = () => gaussian({ dim: 3, scale: 2 });
const base: ExecuteRunOptions = { chains: 2, warmup: 100, draws: 200, seed: 77, checkpointEvery: 40, minCheckpointSeconds: 0, progress: false };

/** Starts a run with a folder and aborts it once some chain has passed `at` iterations. */
async function interrupted(at: number, extra: ExecuteRunOptions = {}): Promise<string> {
  const folder = fresh();
  const controller = new AbortController();
  const run = executeRun(target(), {
    ...base,
    ...extra,
    folder,
    signal: controller.signal,
    onProgress: (p) => {
      if (p.iteration >= at) controller.abort(new Error('stop here'));
    },
  });
  await expect(run).rejects.toThrow('stop here');
  return folder;
}

function slots(folder: string): { path: string; generation: number; text: string }[] {
  return ['a', 'b'].map((s) => {
    const path = join(folder, `checkpoints/slot-${s}.json`);
    const text = readFileSync(path, 'utf8');
    return { path, text, generation: (JSON.parse(text) as { body: { generation: number } }).body.generation };
  }).sort((x, y) => y.generation - x.generation);
}

describe('checkpoints and resume', () => {
  it('an interrupted run, resumed, equals the uninterrupted run: nothing lost, nothing duplicated', async () => {
    const reference = await executeRun(target(), base);
    const folder = await interrupted(190);
    const partial = readRun(folder);
    expect(partial.outcome).toBeNull();
    const resumed = await resumeRun(folder, { target: target(), progress: false });
    expect(resumed.draws).toEqual(reference.draws);
    expect(resumed.stats).toEqual(reference.stats);
    expect(resumed.outputs).toEqual(reference.outputs);
    expect(resumed.adaptation).toEqual(reference.adaptation);
    expect(resumed.notes.join('\n')).toMatch(/\d+ rows written after the checkpoint at iteration \d+ were cut and drawn again/);
    // The trace files hold each iteration exactly once (the reader checks the sequence 0, 1, 2, …).
    const back = readRun(folder, { keepWarmup: true });
    expect(back.draws).toEqual(reference.draws);
    expect(back.warmup!.draws[0].length).toBe(100 * 3);
    expect(readFileSync(join(folder, 'traces/chain-0.csv'), 'utf8').trimEnd().split('\n')).toHaveLength(1 + 300);
  });

  it('a damaged newest checkpoint is named and passed over; the previous one gives the same draws', async () => {
    const reference = await executeRun(target(), base);
    const folder = await interrupted(150);
    const [newest, previous] = slots(folder);
    // Change one digit inside the body: still JSON, but the digest no longer matches.
    writeFileSync(newest.path, newest.text.replace(/"iteration":(\d)/, (_, d: string) => `"iteration":${(Number(d) + 1) % 10}`));
    const resumed = await resumeRun(folder, { target: target(), progress: false });
    expect(resumed.notes.join('\n')).toMatch(
      new RegExp(`slot-.\\.json cannot be used: its contents do not match their SHA-256 digest .*using generation ${previous.generation}`),
    );
    expect(resumed.draws).toEqual(reference.draws);
    expect(resumed.stats).toEqual(reference.stats);
  });

  it('a truncated newest checkpoint is passed over too; when none is usable the error says what to do', async () => {
    const folder = await interrupted(150);
    const [newest, previous] = slots(folder);
    writeFileSync(newest.path, newest.text.slice(0, 300));
    await expect(resumeRun(folder, { target: target(), progress: false })).resolves.toMatchObject({
      notes: expect.arrayContaining([expect.stringMatching(/not valid JSON \(damaged or truncated/)]),
    });
    const other = await interrupted(150);
    const both = slots(other);
    writeFileSync(both[0].path, '{"format":"apsis-run-checkpoint"');
    writeFileSync(both[1].path, both[1].text.replace('"sha256":"', '"sha256":"0'));
    const attempt = resumeRun(other, { target: target(), progress: false });
    await expect(attempt).rejects.toThrow(CheckpointError);
    await expect(attempt).rejects.toThrow(/No usable checkpoint is left; to start the run again from its first iteration, delete the checkpoint files/);
    expect(previous.generation).toBeGreaterThan(0);
  });

  it('skips boundaries reached sooner than minCheckpointSeconds, but always checkpoints the end', async () => {
    const folder = fresh();
    await executeRun(target(), { ...base, folder, checkpointEvery: 10, minCheckpointSeconds: 3600 });
    // Boundary 10 is written at once, 20 … 290 fall within the hour, 300 is the end.
    expect(slots(folder).map((x) => x.generation)).toEqual([2, 1]);
    const newest = JSON.parse(slots(folder)[0].text) as { body: { iteration: number } };
    expect(newest.body.iteration).toBe(300);
  });

  it('refuses a different target: it would not reproduce the checkpointed log densities', async () => {
    const folder = await interrupted(150);
    const attempt = resumeRun(folder, { target: gaussian({ dim: 3, scale: 2.5 }), progress: false });
    await expect(attempt).rejects.toThrow(TargetMismatchError);
    await expect(attempt).rejects.toThrow(/not the target the run was made with/);
    // The refused attempt left the traces alone: a proper resume still works.
    const reference = await executeRun(target(), base);
    expect((await resumeRun(folder, { target: target(), progress: false })).draws).toEqual(reference.draws);
  });

  it('a run until converged, interrupted and resumed, stops where the uninterrupted one stops', async () => {
    const criteria = { minBulkEss: 150, minTailEss: 150, firstCheck: 40, maxDraws: 2000 };
    const { draws: _d, ...fixed } = base;
    const reference = await executeRun(target(), { ...fixed, untilConverged: criteria });
    const folder = fresh();
    const controller = new AbortController();
    await expect(
      executeRun(target(), {
        ...fixed,
        untilConverged: criteria,
        folder,
        signal: controller.signal,
        onProgress: (p) => p.iteration >= 130 && controller.abort(new Error('stop here')),
      }),
    ).rejects.toThrow('stop here');
    const resumed = await resumeRun(folder, { target: target(), progress: false });
    expect(resumed.stop).toEqual(reference.stop);
    expect(resumed.draws).toEqual(reference.draws);
    expect(readRun(folder).outcome?.stop.reason).toBe(reference.stop.reason);
  });
});

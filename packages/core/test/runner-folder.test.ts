import { appendFileSync, existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, symlinkSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { executeRun, readRun, resumeRun, RunFolderError } from '../src/runner/index.js';
import { gaussian } from './fixtures/targets.js';

// The run folder format is this project's own (docs/run-folder-format.md); the checks
// below hold the reader to it and to the rule that folders are untrusted input.
const root = mkdtempSync(join(tmpdir(), 'apsis-folder-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
let n = 0;
const fresh = (): string => join(root, `run-${n++}`);
const options = { chains: 2, warmup: 60, draws: 80, seed: 31, checkpointEvery: 40, progress: false } as const;

async function makeRun(): Promise<{ folder: string; result: Awaited<ReturnType<typeof executeRun>> }> {
  const folder = fresh();
  const result = await executeRun(gaussian({ dim: 2 }), { ...options, folder });
  return { folder, result };
}

function editManifest(folder: string, edit: (m: Record<string, unknown>) => void): void {
  const path = join(folder, 'apsis-run.json');
  const m = JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
  edit(m);
  writeFileSync(path, JSON.stringify(m));
}

describe('run folder', () => {
  it('reads back exactly what the run returned (draws, statistics, outputs, adaptation)', async () => {
    const { folder, result } = await makeRun();
    const read = readRun(folder);
    expect(read.draws).toEqual(result.draws);
    expect(read.stats).toEqual(result.stats);
    expect(read.outputs).toEqual(result.outputs);
    expect(read.adaptation).toEqual(result.adaptation);
    expect(read.seed).toBe(31);
    expect(read.settings).toEqual(result.settings);
    expect(read.outcome?.stop.reason).toBe('completed');
    expect(read.notes).toEqual([]);
    const header = readFileSync(join(folder, 'traces/chain-0.csv'), 'utf8').split('\n')[0];
    expect(header).toBe('iteration,step_size,tree_depth,gradient_evals,diverged,hamiltonian,acceptance,log_density,u:x[0],u:x[1],radius,x0_squared');
    const withWarmup = readRun(folder, { keepWarmup: true });
    expect(withWarmup.warmup?.draws[0].length).toBe(60 * 2);
  });

  it('ignores a torn last line with a note, and resume cuts it away', async () => {
    const { folder, result } = await makeRun();
    rmSync(join(folder, 'outcome.json')); // as if killed before the end
    appendFileSync(join(folder, 'traces/chain-1.csv'), '140,0.71,2,3,0,1.2');
    const read = readRun(folder);
    expect(read.notes.join('\n')).toMatch(/chain-1\.csv: the last line .*no newline.* was cut off/);
    expect(read.draws).toEqual(result.draws);
    const resumed = await resumeRun(folder, { target: gaussian({ dim: 2 }), progress: false });
    expect(resumed.draws).toEqual(result.draws);
    expect(readFileSync(join(folder, 'traces/chain-1.csv'), 'utf8').endsWith('\n')).toBe(true);
    expect(readRun(folder).notes).toEqual([]);
  });

  it('takes a damaged complete last line as torn, but a damaged middle line is an error naming the line', async () => {
    const { folder } = await makeRun();
    rmSync(join(folder, 'outcome.json'));
    const path = join(folder, 'traces/chain-0.csv');
    appendFileSync(path, '140,0.7,zz\n');
    expect(readRun(folder).notes.join('\n')).toMatch(/line 142\) is damaged \(expected 12 fields, found 3\)/);
    const lines = readFileSync(path, 'utf8').split('\n');
    lines[10] = lines[10].replace(/,[^,]*$/, ',not-a-number');
    writeFileSync(path, lines.join('\n'));
    expect(() => readRun(folder)).toThrow(/chain-0\.csv, line 11: field 12 = "not-a-number" is not a number/);
  });

  it('gives clear errors for a missing, foreign, truncated or empty-headed folder', async () => {
    expect(() => readRun(join(root, 'nowhere'))).toThrow(/does not exist/);
    const foreign = fresh();
    mkdirSync(foreign);
    writeFileSync(join(foreign, 'notes.txt'), 'hello');
    expect(() => readRun(foreign)).toThrow(/not an apsis run folder: it has no apsis-run\.json/);
    writeFileSync(join(foreign, 'apsis-run.json'), JSON.stringify({ format: 'some-other-tool', version: 3 }));
    expect(() => readRun(foreign)).toThrow(/foreign: format "some-other-tool"/);
    const { folder } = await makeRun();
    const text = readFileSync(join(folder, 'apsis-run.json'), 'utf8');
    writeFileSync(join(folder, 'apsis-run.json'), text.slice(0, text.length >> 1));
    expect(() => readRun(folder)).toThrow(RunFolderError);
    expect(() => readRun(folder)).toThrow(/damaged or truncated/);
    writeFileSync(join(folder, 'apsis-run.json'), text);
    editManifest(folder, (m) => (m.chains = 'two'));
    expect(() => readRun(folder)).toThrow(/field `chains` = "two"/);
    writeFileSync(join(folder, 'apsis-run.json'), text);
    truncateSync(join(folder, 'traces/chain-0.csv'), 20);
    expect(() => readRun(folder)).toThrow(/chain-0\.csv is truncated: it has no complete header line/);
  });

  it('rejects trace and checkpoint paths that leave the folder (.., absolute, symbolic links)', async () => {
    const { folder } = await makeRun();
    const text = readFileSync(join(folder, 'apsis-run.json'), 'utf8');
    writeFileSync(join(root, 'outside.csv'), 'iteration\n');
    editManifest(folder, (m) => ((m.traces as string[])[0] = '../outside.csv'));
    expect(() => readRun(folder)).toThrow(/segment "\.\." is not allowed/);
    writeFileSync(join(folder, 'apsis-run.json'), text);
    editManifest(folder, (m) => ((m.traces as string[])[1] = join(root, 'outside.csv')));
    expect(() => readRun(folder)).toThrow(/absolute paths are not allowed/);
    writeFileSync(join(folder, 'apsis-run.json'), text);
    editManifest(folder, (m) => ((m.checkpoints as { slots: string[] }).slots[0] = 'checkpoints/../../x.json'));
    expect(() => readRun(folder)).toThrow(/segment "\.\."/);
    writeFileSync(join(folder, 'apsis-run.json'), text);
    rmSync(join(folder, 'traces/chain-1.csv'));
    symlinkSync(join(root, 'outside.csv'), join(folder, 'traces/chain-1.csv'));
    expect(() => readRun(folder)).toThrow(/is a symbolic link/);
  });

  it('never imports the module a folder names unless it is an apsis package', async () => {
    const folder = fresh();
    const module = fileURLToPath(new URL('./fixtures/markerTarget.ts', import.meta.url));
    // Made in the calling thread: the recipe is recorded, the module imported once here.
    await executeRun({ module, exportName: 'standard' }, { chains: 1, warmup: 20, draws: 20, seed: 1, threads: 0, folder, progress: false });
    rmSync(join(folder, 'outcome.json'));
    const marker = join(root, 'marker.txt');
    process.env.APSIS_TEST_MARKER = marker;
    try {
      await expect(resumeRun(folder, { progress: false })).rejects.toThrow(/not an apsis package.*--module/);
      expect(existsSync(marker)).toBe(false);
      readRun(folder);
      expect(existsSync(marker)).toBe(false);
    } finally {
      delete process.env.APSIS_TEST_MARKER;
    }
  });

  it('a run that cannot start (aborted, or a target that cannot be built) leaves no folder behind', async () => {
    const folder = fresh();
    const controller = new AbortController();
    controller.abort(new Error('not today'));
    await expect(executeRun(gaussian(null), { ...options, folder, signal: controller.signal })).rejects.toThrow('not today');
    const module = fileURLToPath(new URL('./fixtures/targets.ts', import.meta.url));
    await expect(executeRun({ module, exportName: 'broken' }, { ...options, folder, threads: 0 })).rejects.toThrow(/refuses to build/);
    expect(existsSync(folder)).toBe(false);
  });

  it('refuses to start a run in a folder that is not empty', async () => {
    const { folder } = await makeRun();
    await expect(executeRun(gaussian(null), { ...options, folder })).rejects.toThrow(/not empty.*already holds a run: resume it/);
  });
});

import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';
import { executeRun, readRun, resumeRun } from '../packages/core/src/runner/index.js';
import { killableOptions, killableRecipe } from '../packages/core/test/fixtures/killableRun.js';
import { gaussian } from '../packages/core/test/fixtures/targets.js';

// Reference: the same run, uninterrupted, in this thread. SIGKILL gives the process no
// chance to clean up, so this checks the on-disk protocol itself: rows are appended,
// checkpoints are written to a temporary file, fsynced and renamed, and resume cuts the
// traces back to the newest checkpoint (common practice for crash-safe files).
const root = mkdtempSync(join(tmpdir(), 'apsis-kill-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
const script = fileURLToPath(new URL('../packages/core/test/fixtures/killableRun.ts', import.meta.url));
const tsx = pathToFileURL(createRequire(import.meta.url).resolve('tsx')).href;

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe('a run killed with SIGKILL', () => {
  it('resumes to exactly the draws of an uninterrupted run: nothing lost, nothing duplicated', async () => {
    const folder = join(root, 'killed');
    const child = spawn(process.execPath, ['--conditions=source', '--import', tsx, script, folder], { stdio: ['ignore', 'pipe', 'pipe'] });
    let output = '';
    child.stdout.on('data', (d) => (output += String(d)));
    child.stderr.on('data', (d) => (output += String(d)));
    const exited = new Promise<{ code: number | null; signal: NodeJS.Signals | null }>((resolve) => child.on('exit', (code, signal) => resolve({ code, signal })));
    // Wait for two checkpoints (both slots written), then kill mid-run.
    const slot = (s: string) => join(folder, `checkpoints/slot-${s}.json`);
    const deadline = Date.now() + 60_000;
    while (!(existsSync(slot('a')) && existsSync(slot('b')))) {
      if (Date.now() > deadline || child.exitCode !== null) throw new Error(`no checkpoints from the child run:\n${output}`);
      await sleep(20);
    }
    child.kill('SIGKILL');
    const { signal } = await exited;
    expect(signal).toBe('SIGKILL');
    expect(existsSync(join(folder, 'outcome.json'))).toBe(false);
    const before = readRun(folder);
    expect(Math.min(...before.drawsPerChain)).toBeLessThan(killableOptions.draws);

    // Resume on worker threads, without the busy work (the target's values are unchanged).
    const resumed = await resumeRun(folder, { target: killableRecipe(0), threads: 2, progress: false });
    const reference = await executeRun(gaussian(killableRecipe(0).args), { ...killableOptions, progress: false });
    expect(resumed.stop.reason).toBe('completed');
    expect(resumed.draws).toEqual(reference.draws);
    expect(resumed.stats).toEqual(reference.stats);
    expect(resumed.outputs).toEqual(reference.outputs);
    expect(resumed.adaptation).toEqual(reference.adaptation);

    // On disk: each chain's trace is iterations 0 … 599 once each (the reader checks the
    // sequence), and reading the folder gives the same draws.
    const after = readRun(folder, { keepWarmup: true });
    expect(after.draws).toEqual(reference.draws);
    for (let c = 0; c < killableOptions.chains; c++) {
      const rows = readFileSync(join(folder, `traces/chain-${c}.csv`), 'utf8').trimEnd().split('\n').slice(1);
      expect(rows.map((r) => Number(r.split(',')[0]))).toEqual(Array.from({ length: 600 }, (_, i) => i));
    }
  });
});

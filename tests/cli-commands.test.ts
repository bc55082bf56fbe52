import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runCli } from '../packages/cli/src/index.js';
import { executeRun, readRun } from '../packages/core/src/runner/index.js';

const root = mkdtempSync(join(tmpdir(), 'apsis-cli-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));
const fixtures = fileURLToPath(new URL('../packages/core/test/fixtures/targets.ts', import.meta.url));
const bin = fileURLToPath(new URL('../packages/cli/bin/apsis.mjs', import.meta.url));
const good = join(root, 'good');
const stuck = join(root, 'stuck');

async function cli(...args: string[]): Promise<{ status: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const status = await runCli(args, {
    stdout: { write: (s: string) => (out += s) },
    stderr: { write: (s: string) => (err += s) },
    cwd: root,
    env: {},
  });
  return { status, out, err };
}

beforeAll(async () => {
  await executeRun({ module: fixtures, exportName: 'gaussian', args: { dim: 2 } }, { chains: 4, warmup: 200, draws: 500, seed: 8, folder: good, threads: 0, progress: false });
  await executeRun(
    { module: fixtures, exportName: 'bimodal', args: { gap: 12 } },
    { chains: 2, warmup: 100, draws: 200, seed: 8, folder: stuck, threads: 0, progress: false, init: [[-6, 0], [6, 0]] },
  );
});

describe('apsis summary', () => {
  it('prints the run, the table, health and a verdict, and exits 0 when no check fails', async () => {
    const r = await cli('summary', 'good');
    expect(r.status).toBe(0);
    expect(r.out).toMatch(/sampler: NUTS, diagonal metric, 4 chains, 200 warmup iterations, seed 8/);
    expect(r.out).toMatch(/finished: drew all 500 draws per chain/);
    expect(r.out).toMatch(/^radius +\d/m);
    expect(r.out).toMatch(/Sampler health \(\d+ divergent transitions in 2000 draws\)/);
    expect(r.out).toMatch(/Converged: yes/);
  });

  it('--json gives the same figures for machines; the radius mean matches the Rayleigh mean', async () => {
    const r = await cli('summary', join(root, 'good'), '--json');
    expect(r.status).toBe(0);
    const j = JSON.parse(r.out) as {
      format: string;
      run: { drawsPerChain: number[]; finished: boolean };
      summary: { quantities: { name: string; mean: number; mcseMean: number }[] };
      verdict: { converged: boolean };
    };
    expect(j.format).toBe('apsis-run-summary');
    expect(j.run.drawsPerChain).toEqual([500, 500, 500, 500]);
    expect(j.verdict.converged).toBe(true);
    // |x| of a 2-D standard normal is Rayleigh-distributed with mean sqrt(pi/2) (a standard
    // result, from memory: E|x| = ∫ r² e^{-r²/2} dr = sqrt(pi/2)); tolerance 4 Monte Carlo
    // standard errors.
    const radius = j.summary.quantities.find((q) => q.name === 'radius')!;
    expect(Math.abs(radius.mean - Math.sqrt(Math.PI / 2))).toBeLessThan(4 * radius.mcseMean);
    const all = JSON.parse((await cli('summary', 'good', '--json', '--all')).out) as typeof j;
    expect(all.summary.quantities.map((q) => q.name)).toEqual(['radius', 'x0_squared', 'u:x[0]', 'u:x[1]']);
  });

  it('exits 1 when chains have not mixed, naming the problem', async () => {
    const r = await cli('summary', 'stuck');
    expect(r.status).toBe(1);
    expect(r.out).toMatch(/Converged: no/);
    expect(r.out).toMatch(/R-hat/);
    const j = JSON.parse((await cli('summary', 'stuck', '--json')).out) as { verdict: { converged: boolean; reasons: string[] } };
    expect(j.verdict.converged).toBe(false);
    expect(j.verdict.reasons.length).toBeGreaterThan(0);
  });

  it('exits 2 with one clear line for a missing, foreign or unsafe folder and for bad usage', async () => {
    const missing = await cli('summary', 'nowhere');
    expect(missing.status).toBe(2);
    expect(missing.err).toMatch(/^apsis: run folder .*nowhere does not exist\n$/);
    mkdirSync(join(root, 'foreign'));
    writeFileSync(join(root, 'foreign', 'data.csv'), 'a,b\n1,2\n');
    expect(await cli('summary', 'foreign')).toMatchObject({ status: 2, err: expect.stringMatching(/not an apsis run folder/) });
    const escape = join(root, 'escape');
    rmSync(escape, { recursive: true, force: true });
    await executeRun({ module: fixtures, exportName: 'gaussian', args: null }, { chains: 1, warmup: 20, draws: 20, seed: 2, folder: escape, threads: 0, progress: false });
    const m = JSON.parse(readFileSync(join(escape, 'apsis-run.json'), 'utf8')) as { traces: string[] };
    m.traces[0] = '../good/traces/chain-0.csv';
    writeFileSync(join(escape, 'apsis-run.json'), JSON.stringify(m));
    expect(await cli('summary', 'escape')).toMatchObject({ status: 2, err: expect.stringMatching(/segment "\.\." is not allowed/) });
    expect(await cli('summary')).toMatchObject({ status: 2, err: expect.stringMatching(/expected one run folder, got none/) });
    expect(await cli('summary', 'good', '--colour')).toMatchObject({ status: 2, err: expect.stringMatching(/--colour/) });
    expect(await cli('summary', 'good', '--rhat', '0.5')).toMatchObject({ status: 2, err: expect.stringMatching(/--rhat "0.5": expected a number above 1/) });
    expect(await cli('frobnicate')).toMatchObject({ status: 2, err: expect.stringMatching(/unknown command "frobnicate"/) });
    expect(await cli('--help')).toMatchObject({ status: 0, out: expect.stringMatching(/apsis summary <run folder>/) });
    expect(await cli('resume', '--help')).toMatchObject({ status: 0, out: expect.stringMatching(/--module PATH/) });
  });
});

describe('apsis resume and report', () => {
  it('resumes only with a module the user names, then equals the uninterrupted run', async () => {
    const folder = join(root, 'interrupted');
    const recipe = { module: fixtures, exportName: 'gaussian', args: { dim: 2, scale: 3 } };
    const options = { chains: 2, warmup: 80, draws: 120, seed: 13, checkpointEvery: 30, threads: 0, progress: false } as const;
    const controller = new AbortController();
    await expect(
      executeRun(recipe, { ...options, folder, signal: controller.signal, onProgress: (p) => p.iteration >= 150 && controller.abort(new Error('cut')) }),
    ).rejects.toThrow('cut');
    const refused = await cli('resume', 'interrupted');
    expect(refused.status).toBe(2);
    expect(refused.err).toMatch(/not an apsis package.*--module/);
    const done = await cli('resume', 'interrupted', '--module', fixtures, '--quiet', '--threads', '0');
    expect(done.err).toBe('');
    expect(done.status).toBe(0);
    expect(done.out).toMatch(/drew all 120 draws per chain/);
    const reference = await executeRun(recipe, options);
    expect(readRun(folder).draws).toEqual(reference.draws);
    expect((await cli('resume', 'interrupted', '--module', fixtures, '--quiet')).out).toMatch(/already finished/);
  });

  it('writes a self-contained HTML report', async () => {
    const r = await cli('report', 'good', '--out', 'report-out', '--title', 'Invented test run');
    expect(r.status).toBe(0);
    const file = join(root, 'report-out', 'report.html');
    expect(existsSync(file)).toBe(true);
    const html = readFileSync(file, 'utf8');
    expect(html).toMatch(/Invented test run/);
    expect(html).toMatch(/<svg/);
  });

  it('runs as the `apsis` command through its bin script, with exit statuses intact', () => {
    const ok = spawnSync(process.execPath, [bin, 'summary', good, '--json'], { encoding: 'utf8', env: { ...process.env, CI: '1' } });
    expect(ok.status).toBe(0);
    expect((JSON.parse(ok.stdout) as { verdict: { converged: boolean } }).verdict.converged).toBe(true);
    const bad = spawnSync(process.execPath, [bin, 'summary', stuck], { encoding: 'utf8' });
    expect(bad.status).toBe(1);
  });
});

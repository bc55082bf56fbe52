import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { executeRun, RunOptionsError, TargetRecipeError } from '../src/runner/index.js';
import { runningFromSource, tsxRegisterUrl } from '../src/runner/workerLaunch.js';
import { runChains } from '../src/sampler/index.js';
import { gaussian } from './fixtures/targets.js';

// Reference for every check here: the in-thread sampler itself. Each chain depends only
// on (seed, chain index, settings), so moving chains onto worker threads must not change
// a single bit (DESIGN.md, "Same seed, same options: bit-identical draws").
const fixtures = fileURLToPath(new URL('./fixtures/targets.ts', import.meta.url));
const recipe = { module: fixtures, exportName: 'gaussian', args: { dim: 3, scale: 1.5 } };
const options = { chains: 3, warmup: 150, draws: 120, seed: 2024 } as const;

describe('parallel chains', () => {
  it('runs from TypeScript sources with tsx registered in each worker', () => {
    expect(runningFromSource()).toBe(true);
    expect(existsSync(fileURLToPath(tsxRegisterUrl()))).toBe(true);
  });

  it('2 worker threads, the calling thread and the plain sampler give bit-identical draws', async () => {
    const parallel = await executeRun(recipe, { ...options, threads: 2, progress: false });
    const serial = await executeRun(gaussian(recipe.args), { ...options, progress: false });
    const plain = await runChains(gaussian(recipe.args), options);
    expect(parallel.threads).toBe(2);
    expect(serial.threads).toBe(0);
    for (const other of [serial, plain]) {
      expect(parallel.draws).toEqual(other.draws);
      expect(parallel.stats).toEqual(other.stats);
      expect(parallel.outputs).toEqual(other.outputs);
      expect(parallel.adaptation).toEqual(other.adaptation);
      expect(parallel.divergences).toEqual(other.divergences);
    }
    expect(parallel.names).toEqual(['x[0]', 'x[1]', 'x[2]']);
    expect(parallel.stop.reason).toBe('completed');
    // Distinct chains really are distinct.
    expect(parallel.draws[0]).not.toEqual(parallel.draws[1]);
  });

  it('runChains hands a recipe to the runner (default threads) with the same draws', async () => {
    const viaRunChains = await runChains(recipe, { ...options, progress: false });
    const plain = await runChains(gaussian(recipe.args), options);
    expect(viaRunChains.draws).toEqual(plain.draws);
  });

  it('refuses worker threads for an in-memory target, naming the option', async () => {
    await expect(executeRun(gaussian(null), { threads: 2, draws: 10, warmup: 10 })).rejects.toThrow(RunOptionsError);
    await expect(executeRun(gaussian(null), { threads: 2, draws: 10, warmup: 10 })).rejects.toThrow(/threads.*recipe/);
  });

  it('reports a factory that throws inside a worker, and a missing export, as TargetRecipeError', async () => {
    const broken = executeRun({ module: fixtures, exportName: 'broken' }, { chains: 1, threads: 1, warmup: 10, draws: 10, progress: false });
    await expect(broken).rejects.toThrow(TargetRecipeError);
    await expect(broken).rejects.toThrow(/refuses to build/);
    const missing = executeRun({ module: fixtures, exportName: 'noSuchFactory' }, { chains: 1, threads: 0, warmup: 10, draws: 10 });
    await expect(missing).rejects.toThrow(/export `noSuchFactory`.*gaussian/);
  });
});

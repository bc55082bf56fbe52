import { randomInt } from 'node:crypto';
import { resolve } from 'node:path';
import type { Target } from '../target.js';
import type { ChainStart, HostEvent } from './chainHost.js';
import type { ChainExecutor } from './chainExecutor.js';
import { createChainTrace } from './chainTrace.js';
import { RunOptionsError, TargetRecipeError } from './errors.js';
import { createInThreadExecutor } from './inThreadExecutor.js';
import { checkNewFolder, checkpointSlots, createFolderLayout, newRunId, openWriters, softwareVersions, traceFileName, writeManifest } from './runFolder.js';
import { runFolderFormat, runFolderVersion, samplerKnobs, type RunManifest } from './runManifest.js';
import { defaultThreads, resolveExecuteOptions, type ExecuteRunOptions } from './runnerOptions.js';
import { driveSession, type FolderSink, type LongRunResult } from './runSession.js';
import { checkTarget, isTargetRecipe, loadRecipeTarget, resolveTargetRecipe, type ResolvedTargetRecipe, type TargetRecipe } from './targetRecipe.js';
import { startWorkerExecutor } from './workerExecutor.js';

/** An event sink whose handler is attached later (once the session is set up). */
export function deferredSink(): { sink: (event: HostEvent) => void; listen: (handler: (event: HostEvent) => void) => void } {
  let handler: ((event: HostEvent) => void) | null = null;
  const early: HostEvent[] = [];
  return {
    sink: (event) => (handler ? handler(event) : early.push(event)),
    listen: (h) => {
      handler = h;
      for (const e of early.splice(0)) h(e);
    },
  };
}

/** Coordinate names: the target's, or `x[0]`, `x[1]`, …. */
export function coordinateNames(names: readonly string[] | null, dim: number): string[] {
  return names ? [...names] : Array.from({ length: dim }, (_, i) => `x[${i}]`);
}

/**
 * Starts the executor for a run: worker threads for a recipe with `threads` > 0,
 * else the calling thread (building the recipe's target here when needed).
 */
export async function startExecutor(
  target: Target | null,
  recipe: ResolvedTargetRecipe | null,
  threads: number,
  settings: Parameters<typeof createInThreadExecutor>[1],
  starts: readonly ChainStart[],
  sink: (event: HostEvent) => void,
): Promise<ChainExecutor> {
  if (recipe !== null && threads > 0) return startWorkerExecutor(recipe, settings, starts, threads, sink);
  const t = target ?? (await loadRecipeTarget(recipe!));
  return createInThreadExecutor(t, settings, starts, sink);
}

/**
 * Samples a target with the long-run machinery: chains on worker threads, progress on
 * the terminal or a callback, traces streamed into a run folder with periodic
 * atomic checkpoints, and optionally drawing until converged.
 *
 * `target` is a `Target` (runs in the calling thread) or a {@link TargetRecipe} that
 * each worker rebuilds (needed for `threads` > 0, and for resuming the run from the
 * command line). Same seed and options give bit-identical draws whatever the number
 * of threads. Resolves to `runChains`' result plus how the run stopped.
 *
 * Throws `RunOptionsError` / `SamplerOptionsError` for bad options, `RunFolderError`
 * for an unusable folder, `TargetRecipeError` when a recipe cannot build its target,
 * `InitialisationError` when a chain finds no start, `WorkerFailureError` when a
 * worker dies; rejects with the signal's reason when aborted.
 */
export async function executeRun(target: Target | TargetRecipe, options: ExecuteRunOptions = {}): Promise<LongRunResult> {
  const calledAt = performance.now();
  const { sampler: o, runner } = resolveExecuteOptions(options, 'executeRun');
  let recipe: ResolvedTargetRecipe | null = null;
  let inMemory: Target | null = null;
  if (isTargetRecipe(target)) recipe = resolveTargetRecipe(target);
  else {
    try {
      inMemory = checkTarget(target, 'executeRun: target');
    } catch (e) {
      if (e instanceof TargetRecipeError) throw new RunOptionsError(e.message);
      throw e;
    }
  }
  const threads = runner.threads ?? (recipe !== null ? defaultThreads(o.chains) : 0);
  if (recipe === null && threads > 0) {
    throw new RunOptionsError(
      `executeRun: option \`threads\` = ${threads}: an in-memory target runs in the calling thread (functions cannot cross into worker threads); pass a target recipe { module, exportName, args } to use worker threads, or threads: 0`,
    );
  }
  if (inMemory !== null && o.init !== undefined) {
    o.init.forEach((x, c) => {
      if (x.length !== inMemory!.dim) throw new RunOptionsError(`executeRun: option \`init[${c}]\` has length ${x.length}: expected target.dim = ${inMemory!.dim}`);
    });
  }
  if (o.init !== undefined && o.init.length !== o.chains) {
    throw new RunOptionsError(`executeRun: option \`init\` has ${o.init.length} positions: expected one per chain (chains = ${o.chains})`);
  }
  const seed = o.seed ?? randomInt(0, 2 ** 47);
  const settings = o.settings;
  const init = o.init?.map((x) => Array.from(x));
  const starts: ChainStart[] = Array.from({ length: o.chains }, (_, chain) => ({ chain, seed, ...(init ? { init: init[chain] } : {}) }));
  const folderPath = runner.folder === null ? null : resolve(runner.folder);
  if (folderPath !== null) checkNewFolder(folderPath);
  if (o.signal?.aborted) throw o.signal.reason ?? new Error('executeRun: aborted');

  const { sink, listen } = deferredSink();
  const executor = await startExecutor(inMemory, recipe, threads, settings, starts, sink);
  const names = coordinateNames(executor.names, executor.dim);
  const outputNames = [...executor.outputNames];
  let folder: FolderSink | null = null;
  try {
    if (folderPath !== null) {
      createFolderLayout(folderPath);
      const manifest: RunManifest = {
        format: runFolderFormat,
        version: runFolderVersion,
        runId: newRunId(),
        createdAt: new Date().toISOString(),
        software: softwareVersions(),
        label: runner.label,
        seed,
        chains: o.chains,
        dim: executor.dim,
        sampler: samplerKnobs(settings),
        settings,
        init: init ?? null,
        columns: { coordinates: names, outputs: outputNames },
        traces: Array.from({ length: o.chains }, (_, c) => traceFileName(c)),
        checkpoints: runner.checkpointEvery > 0 ? { every: runner.checkpointEvery, slots: checkpointSlots } : null,
        recipe,
        untilConverged: runner.untilConverged,
      };
      writeManifest(folderPath, manifest);
      folder = { path: folderPath, manifest, writers: openWriters(folderPath, manifest), generation: 0 };
    }
  } catch (e) {
    await executor.close();
    throw e;
  }
  return driveSession({
    executor,
    listen,
    settings,
    chains: o.chains,
    seed,
    keepWarmup: o.keepWarmup,
    traces: Array.from({ length: o.chains }, (_, c) => createChainTrace(c, o.keepWarmup ? 0 : settings.warmup, executor.dim, outputNames.length)),
    startIteration: 0,
    folder,
    checkpointEvery: runner.checkpointEvery,
    minCheckpointSeconds: runner.minCheckpointSeconds,
    syncSeconds: runner.syncSeconds,
    criteria: runner.untilConverged,
    names,
    outputNames,
    elapsedBefore: 0,
    calledAt,
    progress: runner.progress,
    onProgress: runner.onProgress,
    signal: o.signal,
    notes: [],
  });
}

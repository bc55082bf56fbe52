import { resolve } from 'node:path';
import type { Target } from '../target.js';
import type { ChainStart } from './chainHost.js';
import { createChainTrace } from './chainTrace.js';
import { readLatestCheckpoint } from './checkpointStore.js';
import { RunFolderError, RunOptionsError } from './errors.js';
import { coordinateNames, deferredSink, startExecutor } from './executeRun.js';
import { resolveInside } from './folderPaths.js';
import type { RunProgress } from './progressTracker.js';
import { readRun } from './readRun.js';
import { recipeForResume } from './recipeTrust.js';
import { manifestHeader, openWriters } from './runFolder.js';
import { readManifest } from './runManifest.js';
import { readOutcome } from './runOutcome.js';
import { defaultThreads } from './runnerOptions.js';
import { driveSession, type LongRunResult } from './runSession.js';
import { checkTarget, isTargetRecipe, resolveTargetRecipe, type ResolvedTargetRecipe, type TargetRecipe } from './targetRecipe.js';
import { readTraceFile } from './traceReader.js';
import { z } from 'zod';
import { describeValue } from '../sampler/optionErrors.js';

/** Options of {@link resumeRun}. */
export interface ResumeRunOptions {
  /**
   * The target: an in-memory `Target` (calling thread), or a recipe. Default: the
   * manifest's recipe, when its module is a trusted apsis package.
   */
  target?: Target | TargetRecipe;
  /** Worker threads (default as for `executeRun`; 0 for an in-memory target). */
  threads?: number;
  progress?: boolean;
  onProgress?: (progress: RunProgress) => void;
  /** Also return warmup iterations. */
  keepWarmup?: boolean;
  signal?: AbortSignal;
  /** Seconds between fsyncs of the trace files (default 5). */
  syncSeconds?: number;
  /** Fewest seconds between two checkpoints (default 10; 0: every boundary). */
  minCheckpointSeconds?: number;
}

const optionsSchema = z.strictObject({
  target: z.unknown().optional(),
  threads: z.number().int().min(0).max(256).optional(),
  progress: z.boolean().optional(),
  onProgress: z.custom<(p: RunProgress) => void>((v) => typeof v === 'function').optional(),
  keepWarmup: z.boolean().optional(),
  signal: z.custom<AbortSignal>((v) => v instanceof AbortSignal).optional(),
  syncSeconds: z.number().gt(0).finite().optional(),
  minCheckpointSeconds: z.number().min(0).finite().optional(),
});

/**
 * Continues an interrupted run from its newest usable checkpoint: validates the
 * folder, rebuilds the target (checking it reproduces the checkpointed log
 * densities), cuts every trace file back to the checkpoint, and runs on. The draws
 * equal those of the uninterrupted run, bit for bit; the result holds all of them
 * (read back from the traces up to the checkpoint). A damaged newest checkpoint is
 * passed over for the previous one, with a note in `notes`. A run that had already
 * finished is read and returned unchanged (with a note).
 */
export async function resumeRun(folder: string, options: ResumeRunOptions = {}): Promise<LongRunResult> {
  const calledAt = performance.now();
  const parsed = optionsSchema.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    if (issue.code === 'unrecognized_keys') throw new RunOptionsError(`resumeRun: unknown option ${issue.keys.map((k) => `\`${k}\``).join(', ')}; known: ${Object.keys(optionsSchema.shape).join(', ')}`);
    const key = String(issue.path[0]);
    throw new RunOptionsError(`resumeRun: option \`${key}\` = ${describeValue((options as Record<string, unknown>)[key])}: ${issue.message}`);
  }
  const path = resolve(folder);
  const manifest = readManifest(path);
  const outcome = readOutcome(path, manifest);
  if (outcome !== null) {
    const done = readRun(path, { keepWarmup: options.keepWarmup });
    return {
      ...done,
      stop: outcome.stop,
      convergence: null,
      folder: path,
      threads: 0,
      notes: [...done.notes, `the run had already finished (${outcome.stop.message}); nothing was drawn`],
      timing: { startup: (performance.now() - calledAt) / 1000, sampling: 0 },
    };
  }

  let recipe: ResolvedTargetRecipe | null = null;
  let inMemory: Target | null = null;
  const given = options.target;
  if (given === undefined) recipe = recipeForResume(manifest.recipe, null, null);
  else if (isTargetRecipe(given)) recipe = resolveTargetRecipe(given);
  else inMemory = checkTarget(given, 'resumeRun: target');
  const threads = options.threads ?? (recipe !== null ? defaultThreads(manifest.chains) : 0);
  if (inMemory !== null && threads > 0) {
    throw new RunOptionsError(`resumeRun: option \`threads\` = ${threads}: an in-memory target runs in the calling thread; pass a recipe to use worker threads`);
  }
  if (inMemory !== null && inMemory.dim !== manifest.dim) {
    throw new RunOptionsError(`resumeRun: target.dim = ${inMemory.dim}, but the run folder's target has dim ${manifest.dim}`);
  }

  const { checkpoint, notes } = readLatestCheckpoint(path, manifest);
  const settings = manifest.settings;
  const warmup = settings.warmup;
  const keepWarmup = options.keepWarmup ?? false;
  const nOut = manifest.columns.outputs.length;
  const header = manifestHeader(manifest);
  const startIteration = checkpoint?.iteration ?? 0;
  const traces = manifest.traces.map((file, c) => {
    const trace = createChainTrace(c, keepWarmup ? 0 : warmup, manifest.dim, nOut);
    if (checkpoint === null) return trace;
    const read = readTraceFile(resolveInside(path, file, `traces[${c}]`), { header, dim: manifest.dim, outputs: nOut, label: file, chain: c, markRows: startIteration });
    const expected = checkpoint.chains[c].traceBytes;
    if (read.markBytes === null || read.block.count < startIteration) {
      throw new RunFolderError(`trace file ${file} has ${read.block.count} complete rows, fewer than the ${startIteration} the checkpoint (generation ${checkpoint.generation}) records: rows were lost, so the run cannot be continued exactly`);
    }
    if (read.markBytes !== expected) {
      throw new RunFolderError(`trace file ${file}: its first ${startIteration} rows take ${read.markBytes} bytes, but the checkpoint recorded ${expected}: the file was changed after the checkpoint`);
    }
    const extra = read.block.count - startIteration;
    for (const n of read.notes) notes.push(n);
    if (extra > 0) notes.push(`${file}: ${extra} row${extra > 1 ? 's' : ''} written after the checkpoint at iteration ${startIteration} were cut and drawn again`);
    trace.append({ ...read.block, count: startIteration });
    return trace;
  });
  if (checkpoint === null && manifest.checkpoints !== null) notes.push('no checkpoint had been written yet: the run starts again from its first iteration');

  const starts: ChainStart[] = Array.from({ length: manifest.chains }, (_, chain) =>
    checkpoint !== null
      ? { chain, restore: checkpoint.chains[chain].state }
      : { chain, seed: manifest.seed, ...(manifest.init ? { init: [...manifest.init[chain]] } : {}) },
  );
  const { sink, listen } = deferredSink();
  const executor = await startExecutor(inMemory, recipe, threads, settings, starts, sink);
  const names = coordinateNames(executor.names, executor.dim);
  if (executor.dim !== manifest.dim || JSON.stringify(names) !== JSON.stringify(manifest.columns.coordinates) || JSON.stringify(executor.outputNames) !== JSON.stringify(manifest.columns.outputs)) {
    await executor.close();
    throw new RunOptionsError(
      `resumeRun: the target's columns (dim ${executor.dim}; ${names.length} coordinates, ${executor.outputNames.length} outputs) differ from the run folder's (dim ${manifest.dim}; ${manifest.columns.coordinates.length} coordinates, ${manifest.columns.outputs.length} outputs): it is not the run's target`,
    );
  }
  let writers;
  try {
    writers = openWriters(path, manifest, checkpoint?.chains.map((ch) => ({ bytes: ch.traceBytes, rows: ch.rows })));
  } catch (e) {
    await executor.close();
    throw e instanceof RunFolderError ? e : new RunFolderError(`cannot open the trace files for writing: ${(e as Error).message}`);
  }
  return driveSession({
    executor,
    listen,
    settings,
    chains: manifest.chains,
    seed: manifest.seed,
    keepWarmup,
    traces,
    startIteration,
    folder: { path, manifest, writers, generation: checkpoint?.generation ?? 0 },
    checkpointEvery: manifest.checkpoints?.every ?? 0,
    minCheckpointSeconds: options.minCheckpointSeconds ?? 10,
    syncSeconds: options.syncSeconds ?? 5,
    criteria: manifest.untilConverged,
    names,
    outputNames: [...executor.outputNames],
    elapsedBefore: checkpoint?.elapsedSeconds ?? 0,
    calledAt,
    progress: options.progress ?? null,
    onProgress: options.onProgress ?? null,
    signal: options.signal,
    notes,
  });
}

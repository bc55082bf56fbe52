import { resolve } from 'node:path';
import type { RunResult, ChainAdaptation } from '../sampler/runChains.js';
import { restoreChainState } from '../sampler/chainCheckpoint.js';
import { createChainTrace } from './chainTrace.js';
import { readLatestCheckpoint, type CheckpointBody } from './checkpointStore.js';
import { CheckpointError } from './errors.js';
import { resolveInside } from './folderPaths.js';
import { manifestHeader } from './runFolder.js';
import { readManifest, type RunManifest } from './runManifest.js';
import { loadAdaptation, readOutcome, type RunOutcome } from './runOutcome.js';
import { readTraceFile } from './traceReader.js';

/** A run folder read back: `runChains`' result shape plus what the folder says about the run. */
export interface RunFolderContents extends RunResult {
  readonly manifest: RunManifest;
  /** The outcome of a finished run; null while the run is unfinished (interrupted or still running). */
  readonly outcome: RunOutcome | null;
  /** Draws (after warmup) read per chain; chains of an unfinished run can differ. */
  readonly drawsPerChain: number[];
  /** Plain-words notes: torn last lines ignored, checkpoints passed over, an unfinished run. */
  readonly notes: string[];
}

/** Options of {@link readRun}. */
export interface ReadRunOptions {
  /** Also return the warmup iterations (default false). */
  keepWarmup?: boolean;
}

function adaptationFromCheckpoint(checkpoint: CheckpointBody | null, chain: number): ChainAdaptation | null {
  if (checkpoint === null) return null;
  try {
    const s = restoreChainState(checkpoint.chains[chain].state);
    const m = s.metric;
    return { stepSize: s.stepSize, metric: m.kind === 'unit' ? { kind: 'unit' } : { kind: m.kind, inverseMass: m.inverseMass.slice() } };
  } catch {
    return null;
  }
}

/**
 * Reads a run folder (untrusted input: validated, never evaluated) into the shape of
 * `runChains`' result. Works on finished and on interrupted runs: a torn last line of
 * a trace is ignored with a note; damaged checkpoints only matter for the adaptation,
 * which comes from the outcome (finished runs) or the newest usable checkpoint.
 * Throws `RunFolderError` for a missing, foreign or damaged folder.
 */
export function readRun(folder: string, options: ReadRunOptions = {}): RunFolderContents {
  const path = resolve(folder);
  const manifest = readManifest(path);
  const outcome = readOutcome(path, manifest);
  const notes: string[] = [];
  let checkpoint: CheckpointBody | null = null;
  try {
    const choice = readLatestCheckpoint(path, manifest);
    checkpoint = choice.checkpoint;
    notes.push(...choice.notes);
  } catch (e) {
    if (!(e instanceof CheckpointError)) throw e;
    notes.push(e.message);
  }
  const settings = manifest.settings;
  const warmup = settings.warmup;
  const keepWarmup = options.keepWarmup ?? false;
  const nOut = manifest.columns.outputs.length;
  const header = manifestHeader(manifest);
  const limit = outcome !== null ? warmup + outcome.stop.drawsPerChain : undefined;
  const traces = manifest.traces.map((file, c) => {
    const read = readTraceFile(resolveInside(path, file, `traces[${c}]`), { header, dim: manifest.dim, outputs: nOut, label: file, chain: c, ...(limit !== undefined ? { maxRows: limit } : {}) });
    notes.push(...read.notes);
    const trace = createChainTrace(c, keepWarmup ? 0 : warmup, manifest.dim, nOut);
    trace.append(read.block);
    return { trace, rows: read.block.count };
  });
  if (outcome !== null) {
    traces.forEach((t, c) => {
      if (t.rows < limit!) notes.push(`${manifest.traces[c]} has ${t.rows} rows but the outcome records ${limit}: the trace was cut after the run finished`);
    });
  }
  const drawsPerChain = traces.map((t) => Math.max(0, t.rows - warmup));
  if (outcome === null) {
    notes.push(`the run has not finished (interrupted, or still running): ${drawsPerChain.join(', ')} draws per chain after warmup so far`);
  }
  const main = traces.map((t, c) => t.trace.section(Math.max(warmup, t.trace.offset), Math.max(warmup, t.trace.offset) + drawsPerChain[c]));
  const warm = keepWarmup ? traces.map((t) => t.trace.section(0, Math.min(warmup, t.rows))) : null;
  const adaptation = manifest.traces.map((_, c) => {
    if (outcome !== null) return loadAdaptation(outcome.adaptation[c]);
    const a = adaptationFromCheckpoint(checkpoint, c);
    if (a !== null) return a;
    return { stepSize: NaN, metric: { kind: 'unit' as const } };
  });
  if (outcome === null && checkpoint === null) notes.push('no usable checkpoint: step sizes and metrics are unknown (NaN step size, unit metric reported)');
  const hasOutputs = nOut > 0;
  return {
    draws: main.map((m) => m.draws),
    stats: main.map((m) => m.stats),
    names: [...manifest.columns.coordinates],
    ...(hasOutputs ? { outputs: { names: [...manifest.columns.outputs], values: main.map((m) => m.outputs) } } : {}),
    ...(warm ? { warmup: { draws: warm.map((w) => w.draws), stats: warm.map((w) => w.stats), ...(hasOutputs ? { outputs: warm.map((w) => w.outputs) } : {}) } } : {}),
    seed: manifest.seed,
    dim: manifest.dim,
    settings: { ...settings, draws: Math.min(...drawsPerChain) },
    adaptation,
    divergences: main.map((m) => m.stats.divergent.reduce((a, b) => a + b, 0)),
    elapsed: outcome?.elapsedSeconds ?? checkpoint?.elapsedSeconds ?? 0,
    manifest,
    outcome,
    drawsPerChain,
    notes,
  };
}

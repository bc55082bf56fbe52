import type { NamedChains } from '@apsis/diagnostics';
import type { ChainSettings } from '../sampler/chainSettings.js';
import type { ChainAdaptation, RunResult } from '../sampler/runChains.js';
import type { ChainStanding, HostEvent } from './chainHost.js';
import type { ChainExecutor } from './chainExecutor.js';
import type { ChainTrace } from './chainTrace.js';
import { writeCheckpoint, type CheckpointChain } from './checkpointStore.js';
import { assessConvergence, checkPoints, type ConvergenceAssessment, type ResolvedConvergenceCriteria } from './convergence.js';
import { RunOptionsError } from './errors.js';
import { createProgressDisplay, progressWanted } from './progressDisplay.js';
import { createProgressTracker, type RunProgress } from './progressTracker.js';
import type { RunManifest } from './runManifest.js';
import { storeAdaptation, writeOutcome, type RunStop } from './runOutcome.js';
import type { TraceWriter } from './traceWriter.js';

/** What `executeRun` and `resumeRun` resolve to: `runChains`' result and how the run ended. */
export interface LongRunResult extends RunResult {
  /** Why the run stopped, and the draws per chain it kept. */
  readonly stop: RunStop;
  /** The last convergence check (null for a fixed-length run). */
  readonly convergence: ConvergenceAssessment | null;
  /** The run folder (absolute path), or null. */
  readonly folder: string | null;
  /** Worker threads used (0: the calling thread). */
  readonly threads: number;
  /** Things worth knowing about this session, in plain words (e.g. a torn trace line ignored on resume). */
  readonly notes: string[];
  /**
   * Wall-clock seconds of this session: `startup` (checking options and folder, starting
   * workers, building targets, reading traces back) and `sampling` (from then to the end).
   */
  readonly timing: { readonly startup: number; readonly sampling: number };
}

/** A run folder being written. */
export interface FolderSink {
  readonly path: string;
  readonly manifest: RunManifest;
  readonly writers: TraceWriter[];
  /** Generation of the last checkpoint written (0: none yet). */
  generation: number;
}

/** Everything a session needs, fresh or resumed. */
export interface SessionSetup {
  readonly executor: ChainExecutor;
  /** Registers the session's event handler with the executor's sink. */
  readonly listen: (handler: (event: HostEvent) => void) => void;
  readonly settings: ChainSettings;
  readonly chains: number;
  readonly seed: number;
  readonly keepWarmup: boolean;
  readonly traces: ChainTrace[];
  /** Iteration every chain starts this session at. */
  readonly startIteration: number;
  readonly folder: FolderSink | null;
  readonly checkpointEvery: number;
  /** Skip a checkpoint boundary reached sooner than this after the previous checkpoint (seconds). */
  readonly minCheckpointSeconds: number;
  readonly syncSeconds: number;
  readonly criteria: ResolvedConvergenceCriteria | null;
  readonly names: string[];
  readonly outputNames: string[];
  /** Seconds taken by earlier sessions. */
  readonly elapsedBefore: number;
  /** performance.now() (ms) when this session's call began. */
  readonly calledAt: number;
  readonly progress: boolean | null;
  readonly onProgress: ((progress: RunProgress) => void) | null;
  readonly signal: AbortSignal | undefined;
  readonly notes: string[];
}

function abortReason(signal: AbortSignal): unknown {
  return signal.reason ?? new Error('run aborted');
}

/** The quantities a convergence check looks at (by name), and how to fetch their draws. */
function convergenceQuantities(setup: SessionSetup): { name: string; kind: 'coordinate' | 'output'; index: number }[] {
  const wanted = setup.criteria?.quantities ?? null;
  const all = [
    ...setup.outputNames.map((name, index) => ({ name, kind: 'output' as const, index })),
    ...setup.names.map((name, index) => ({ name, kind: 'coordinate' as const, index })),
  ];
  if (wanted === null) return setup.outputNames.length > 0 ? all.filter((q) => q.kind === 'output') : all;
  return wanted.map((name) => {
    const found = all.find((q) => q.name === name);
    if (!found) {
      throw new RunOptionsError(
        `option \`untilConverged.quantities\`: no quantity named ${JSON.stringify(name)}; known: ${all.map((q) => q.name).join(', ')}`,
      );
    }
    return found;
  });
}

function describeAssessment(a: ConvergenceAssessment): string {
  if (a.converged) return `check at ${a.drawsPerChain} draws per chain: converged`;
  return `check at ${a.drawsPerChain} draws per chain: not yet (${a.failures.length} quantit${a.failures.length === 1 ? 'y' : 'ies'} short; worst ${a.failures[0]})`;
}

/**
 * Drives a run to its end: advances the chains (to the end, or from check to check
 * for a run until converged), streams rows into the trace files, writes a checkpoint
 * whenever every chain has passed the same multiple of `checkpointEvery`, shows
 * progress, and finally writes the outcome and builds the result.
 */
export async function driveSession(setup: SessionSetup): Promise<LongRunResult> {
  const started = performance.now() / 1000;
  const { executor, settings, chains, traces, folder, criteria } = setup;
  const warmup = settings.warmup;
  const total = warmup + settings.draws;
  const sessionSeconds = (): number => performance.now() / 1000 - started;

  const tracker = createProgressTracker({
    chains,
    warmup,
    total,
    start: traces.map(() => setup.startIteration),
    threads: executor.threads,
    untilConverged: criteria !== null,
  });
  const drawProgress = setup.progress ?? progressWanted(process.stderr);
  const display = drawProgress ? createProgressDisplay(process.stderr) : null;
  let quantities: ReturnType<typeof convergenceQuantities> = [];

  let failure: unknown = null;
  const pending = new Map<number, (CheckpointChain | undefined)[]>();
  let lastSync = performance.now() / 1000;
  const checkpointing = folder !== null && folder.manifest.checkpoints !== null && setup.checkpointEvery > 0;

  let lastCheckpoint = -Infinity;
  let goal = -1;
  const saveCheckpoint = (iteration: number, entries: CheckpointChain[]): void => {
    if (folder === null) return;
    const now = performance.now() / 1000;
    if (iteration !== goal && now - lastCheckpoint < setup.minCheckpointSeconds) return;
    lastCheckpoint = now;
    for (const w of folder.writers) w.sync();
    lastSync = performance.now() / 1000;
    folder.generation += 1;
    writeCheckpoint(folder.path, folder.manifest, {
      runId: folder.manifest.runId,
      generation: folder.generation,
      iteration,
      savedAt: new Date().toISOString(),
      elapsedSeconds: setup.elapsedBefore + (performance.now() - setup.calledAt) / 1000,
      chains: entries,
    });
  };

  const handle = (event: HostEvent): void => {
    if (failure !== null) return;
    try {
      if (event.kind === 'rows') {
        traces[event.block.chain].append(event.block);
        if (folder !== null) {
          folder.writers[event.block.chain].append(event.block);
          const t = performance.now() / 1000;
          if (t - lastSync >= setup.syncSeconds) {
            for (const w of folder.writers) w.sync();
            lastSync = t;
          }
        }
      } else if (event.kind === 'snapshot') {
        if (!checkpointing || folder === null) return;
        const w = folder.writers[event.chain];
        let slot = pending.get(event.iteration);
        if (slot === undefined) {
          slot = new Array<CheckpointChain | undefined>(chains).fill(undefined);
          pending.set(event.iteration, slot);
        }
        slot[event.chain] = { chain: event.chain, rows: w.rows, traceBytes: w.bytes, state: event.state };
        if (slot.every((e) => e !== undefined)) {
          pending.delete(event.iteration);
          for (const k of [...pending.keys()]) if (k < event.iteration) pending.delete(k);
          saveCheckpoint(event.iteration, slot as CheckpointChain[]);
        }
      } else {
        const p = tracker.update(event);
        display?.update(p);
        setup.onProgress?.(p);
      }
    } catch (e) {
      failure = e;
      executor.stop();
    }
  };
  setup.listen(handle);

  let aborted = false;
  const onAbort = (): void => {
    aborted = true;
    executor.stop();
  };
  setup.signal?.addEventListener('abort', onAbort, { once: true });
  if (setup.signal?.aborted) onAbort();

  const request = (goal: number) => ({ goal, snapshotEvery: checkpointing ? setup.checkpointEvery : 0, snapshotAtGoal: checkpointing });
  // A stop asked for before an advance starts is honoured here (hosts reset it per advance).
  const advance = async (to: number): Promise<ChainStanding[]> => {
    if (aborted || failure !== null) return standing;
    goal = to;
    return executor.advance(request(to));
  };
  let standing: ChainStanding[] = [];
  let stop: RunStop;
  let assessment: ConvergenceAssessment | null = null;
  try {
    if (criteria !== null) quantities = convergenceQuantities(setup);
    if (criteria === null) {
      standing = await advance(total);
      stop = { reason: 'completed', drawsPerChain: settings.draws, message: `drew all ${settings.draws} draws per chain`, failures: [] };
    } else {
      const points = checkPoints(criteria).filter((p) => warmup + p >= setup.startIteration);
      stop = { reason: 'draw-cap', drawsPerChain: criteria.maxDraws, message: '', failures: [] };
      for (const p of points) {
        standing = await advance(warmup + p);
        if (aborted || failure !== null) break;
        try {
          const named: NamedChains[] = quantities.map((q) => ({
            name: q.name,
            chains: traces.map((t) => t.column(q.kind, q.index, warmup, warmup + p)),
          }));
          assessment = assessConvergence(named, criteria);
        } catch (e) {
          assessment = { drawsPerChain: p, converged: false, quantities: [], failures: [`diagnostics failed: ${(e as Error).message}`] };
        }
        tracker.setStatus(describeAssessment(assessment));
        display?.update(tracker.current(), true);
        const elapsed = setup.elapsedBefore + (performance.now() - setup.calledAt) / 1000;
        if (assessment.converged) {
          stop = { reason: 'converged', drawsPerChain: p, message: `converged after ${p} draws per chain: every checked quantity has R-hat < ${criteria.rhatBelow}, bulk ESS >= ${criteria.minBulkEss} and tail ESS >= ${criteria.minTailEss}`, failures: [] };
          break;
        }
        if (p >= criteria.maxDraws) {
          stop = { reason: 'draw-cap', drawsPerChain: p, message: `not converged: stopped at the draw cap of ${criteria.maxDraws} draws per chain`, failures: assessment.failures };
          break;
        }
        if (criteria.maxSeconds !== null && elapsed >= criteria.maxSeconds) {
          stop = { reason: 'time-cap', drawsPerChain: p, message: `not converged: stopped at the time cap of ${criteria.maxSeconds} s after ${p} draws per chain`, failures: assessment.failures };
          break;
        }
      }
    }
  } catch (e) {
    failure ??= e;
  }
  setup.signal?.removeEventListener('abort', onAbort);
  display?.update(tracker.current(), true);
  display?.finish();

  const closeFiles = (): void => {
    if (folder === null) return;
    for (const w of folder.writers) {
      try {
        w.sync();
      } finally {
        w.close();
      }
    }
  };
  if (failure !== null || aborted) {
    try {
      closeFiles();
    } finally {
      await executor.close();
    }
    if (failure !== null) throw failure;
    throw abortReason(setup.signal!);
  }
  await executor.close();

  const kept = stop!.drawsPerChain;
  const elapsed = setup.elapsedBefore + (performance.now() - setup.calledAt) / 1000;
  if (folder !== null) {
    closeFiles();
    writeOutcome(folder.path, {
      format: 'apsis-run-outcome',
      version: 1,
      runId: folder.manifest.runId,
      finishedAt: new Date().toISOString(),
      elapsedSeconds: elapsed,
      stop: stop!,
      adaptation: standing.map((st) => storeAdaptation(st.adaptation)),
    });
  }
  const main = traces.map((t) => t.section(warmup, warmup + kept));
  const warm = setup.keepWarmup ? traces.map((t) => t.section(0, warmup)) : null;
  const adaptation: ChainAdaptation[] = standing.map((s) => s.adaptation);
  const divergences = main.map((m) => m.stats.divergent.reduce((a, b) => a + b, 0));
  const hasOutputs = setup.outputNames.length > 0;
  return {
    draws: main.map((m) => m.draws),
    stats: main.map((m) => m.stats),
    names: [...setup.names],
    ...(hasOutputs ? { outputs: { names: [...setup.outputNames], values: main.map((m) => m.outputs) } } : {}),
    ...(warm
      ? { warmup: { draws: warm.map((w) => w.draws), stats: warm.map((w) => w.stats), ...(hasOutputs ? { outputs: warm.map((w) => w.outputs) } : {}) } }
      : {}),
    seed: setup.seed,
    dim: executor.dim,
    settings: { ...settings, draws: kept },
    adaptation,
    divergences,
    elapsed,
    stop: stop!,
    convergence: assessment,
    folder: folder?.path ?? null,
    threads: executor.threads,
    notes: setup.notes,
    timing: { startup: started - setup.calledAt / 1000, sampling: sessionSeconds() },
  };
}

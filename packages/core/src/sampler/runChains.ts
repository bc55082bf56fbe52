import { randomInt } from 'node:crypto';
import { wantsRunner, type LongRunOptions } from '../runner/longRunOptions.js';
import type { TargetRecipe } from '../runner/targetRecipe.js';
import type { Target } from '../target.js';
import { advanceChain } from './advanceChain.js';
import type { ChainSettings } from './chainSettings.js';
import { chainPhase, createChainState, type ChainState } from './chainState.js';
import { createChainWorkspace } from './chainWorkspace.js';
import { SamplerOptionsError } from './errors.js';
import { resolveRunOptions, type RunOptions } from './runOptions.js';
import { createStatsColumns, recordStats, type StatsColumns } from './transitionStats.js';

/** Adapted settings of one chain at the end of warmup. */
export interface ChainAdaptation {
  /** Step size used for all draws. */
  readonly stepSize: number;
  /** Inverse mass matrix (posterior covariance estimate) in the target's coordinates. */
  readonly metric:
    | { readonly kind: 'unit' }
    | { readonly kind: 'diagonal'; readonly inverseMass: Float64Array }
    | { readonly kind: 'dense'; readonly inverseMass: Float64Array /* dim × dim, row-major */ };
}

/** Draws and statistics of a block of iterations, per chain. */
export interface RunSection {
  /** Per chain: iterations × dim, row-major, in the target's unconstrained coordinates. */
  readonly draws: Float64Array[];
  /** Per chain: one entry per iteration. */
  readonly stats: StatsColumns[];
  /** Per chain: iterations × outputs, when the target has `outputs`. */
  readonly outputs?: Float64Array[];
}

/** What `runChains` resolves to. */
export interface RunResult {
  /** Per chain: draws × dim, row-major, in the target's unconstrained coordinates. */
  readonly draws: Float64Array[];
  /** Per chain: per-draw sampler statistics as columns. */
  readonly stats: StatsColumns[];
  /** The target's coordinate names, when it has them. */
  readonly names?: string[];
  /** Constrained values and derived quantities, when the target has `outputs`. */
  readonly outputs?: { readonly names: string[]; readonly values: Float64Array[] };
  /** Warmup iterations, only with `keepWarmup: true`. */
  readonly warmup?: RunSection;
  /** The run seed (the given one, or the one drawn). */
  readonly seed: number;
  readonly dim: number;
  /** Settings actually used (defaults filled in). */
  readonly settings: ChainSettings;
  /** Per chain: the adapted step size and metric. */
  readonly adaptation: ChainAdaptation[];
  /** Per chain: divergent transitions after warmup. */
  readonly divergences: number[];
  /** Wall-clock time of the run, in seconds. */
  readonly elapsed: number;
}

/** Iterations run per chain between yields to the event loop, at most. */
const iterationsPerSlice = 50;
/** A slice also ends after this many milliseconds, so expensive targets stay responsive. */
const millisecondsPerSlice = 100;

function checkTarget(target: Target): void {
  if (target === null || typeof target !== 'object') {
    throw new SamplerOptionsError(`runChains: target = ${String(target)}: expected an object with dim and logDensityGrad`);
  }
  if (!Number.isInteger(target.dim) || target.dim < 1) {
    throw new SamplerOptionsError(`runChains: target.dim = ${String(target.dim)}: expected an integer >= 1`);
  }
  if (typeof target.logDensityGrad !== 'function') {
    throw new SamplerOptionsError('runChains: target.logDensityGrad is not a function: expected (x, grad) => number');
  }
}

/** The adapted step size and a copy of the metric of a chain state. */
export function chainAdaptation(state: ChainState): ChainAdaptation {
  const m = state.metric;
  return {
    stepSize: state.stepSize,
    metric: m.kind === 'unit' ? { kind: 'unit' } : { kind: m.kind, inverseMass: m.inverseMass.slice() },
  };
}

function abortReason(signal: AbortSignal): unknown {
  return signal.reason ?? new Error('runChains: aborted');
}

/**
 * Samples `target` with several independent chains in the calling thread: warmup
 * (adaptation) then draws, NUTS or static HMC. Chains take turns in slices of at most
 * 50 iterations or 100 ms, with a yield to the event loop after each slice so progress
 * callbacks and abort signals are served. Each chain depends only on (seed, chain
 * index), so the same seed and options give bit-identical results however the chains
 * are scheduled. Errors thrown by the target propagate.
 *
 * With a target recipe (`{ module, exportName, args }`) or any long-run option
 * (`threads`, `folder`, `checkpointEvery`, `syncSeconds`, `progress`, `untilConverged`,
 * `label`), the run is handed to the runner's `executeRun` (worker threads, run
 * folders, checkpoints, run until converged) with the same draws for the same seed.
 *
 * Throws (rejects with) `SamplerOptionsError` for invalid options and
 * `InitialisationError` when a chain finds no finite starting point.
 */
export async function runChains(target: Target | TargetRecipe, options: RunOptions & LongRunOptions = {}): Promise<RunResult> {
  if (wantsRunner(target, options)) {
    // Worker threads, run folders, checkpoints, progress display, run until converged.
    const { executeRun } = await import('../runner/executeRun.js');
    return executeRun(target, options);
  }
  return runInThread(target as Target, options);
}

async function runInThread(target: Target, options: RunOptions): Promise<RunResult> {
  const started = performance.now();
  checkTarget(target);
  const o = resolveRunOptions(options);
  const { settings, chains } = o;
  const dim = target.dim;
  if (o.init !== undefined) {
    if (o.init.length !== chains) {
      throw new SamplerOptionsError(
        `runChains: option \`init\` has ${o.init.length} positions: expected one per chain (chains = ${chains})`,
      );
    }
    o.init.forEach((x, c) => {
      if (x.length !== dim) {
        throw new SamplerOptionsError(
          `runChains: option \`init[${c}]\` has length ${x.length}: expected target.dim = ${dim}`,
        );
      }
    });
  }
  if (o.signal?.aborted) throw abortReason(o.signal);
  const seed = o.seed ?? randomInt(0, 2 ** 47);
  const outputs = target.outputs;
  const nOut = outputs?.names.length ?? 0;
  const outRow = new Float64Array(nOut);
  const { warmup, draws } = settings;
  const total = warmup + draws;

  const states: ChainState[] = [];
  const workspaces = [];
  for (let c = 0; c < chains; c++) {
    const ws = createChainWorkspace(dim, settings);
    workspaces.push(ws);
    states.push(createChainState(target, settings, c, seed, o.init?.[c], ws));
  }
  const alloc = (rows: number) => ({
    draws: states.map(() => new Float64Array(rows * dim)),
    stats: states.map(() => createStatsColumns(rows)),
    outputs: outputs ? states.map(() => new Float64Array(rows * nOut)) : undefined,
  });
  const main = alloc(draws);
  const warm = o.keepWarmup ? alloc(warmup) : null;
  const adaptation: ChainAdaptation[] = states.map(chainAdaptation);

  let remaining = chains;
  while (remaining > 0) {
    remaining = 0;
    for (let c = 0; c < chains; c++) {
      const state = states[c];
      if (chainPhase(settings, state) === 'done') continue;
      let lastPhase: 'warmup' | 'sampling' = 'warmup';
      const sliceStart = performance.now();
      for (let k = 0; k < iterationsPerSlice && state.iteration < total; k++) {
        if (k > 0 && performance.now() - sliceStart > millisecondsPerSlice) break;
        const step = advanceChain(target, settings, state, workspaces[c]);
        lastPhase = step.phase;
        const section = step.phase === 'warmup' ? warm : main;
        const row = step.phase === 'warmup' ? step.iteration : step.iteration - warmup;
        if (step.iteration === warmup - 1) adaptation[c] = chainAdaptation(state);
        if (section === null) continue;
        section.draws[c].set(step.draw, row * dim);
        recordStats(section.stats[c], row, step.stats);
        if (outputs && section.outputs) {
          outputs.write(step.draw, outRow);
          section.outputs[c].set(outRow, row * nOut);
        }
      }
      if (state.iteration < total) remaining += 1;
      o.onProgress?.({
        chain: c,
        phase: lastPhase,
        iteration: state.iteration,
        total,
        divergences: state.divergences.warmup + state.divergences.sampling,
        stepSize: state.stepSize,
      });
      await new Promise<void>((resolve) => setImmediate(resolve));
      if (o.signal?.aborted) throw abortReason(o.signal);
    }
  }

  const result: RunResult = {
    draws: main.draws,
    stats: main.stats,
    ...(target.names ? { names: [...target.names] } : {}),
    ...(outputs && main.outputs ? { outputs: { names: [...outputs.names], values: main.outputs } } : {}),
    ...(warm ? { warmup: { draws: warm.draws, stats: warm.stats, ...(warm.outputs ? { outputs: warm.outputs } : {}) } } : {}),
    seed,
    dim,
    settings,
    adaptation: warmup === 0 ? states.map(chainAdaptation) : adaptation,
    divergences: states.map((s) => s.divergences.sampling),
    elapsed: (performance.now() - started) / 1000,
  };
  return result;
}

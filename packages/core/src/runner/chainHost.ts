import { advanceChain } from '../sampler/advanceChain.js';
import { restoreChainState, serialiseChainState, type SerialisedChainState } from '../sampler/chainCheckpoint.js';
import type { ChainSettings } from '../sampler/chainSettings.js';
import { createChainState, type ChainState } from '../sampler/chainState.js';
import { createChainWorkspace, type ChainWorkspace } from '../sampler/chainWorkspace.js';
import type { ChainAdaptation } from '../sampler/runChains.js';
import type { Target } from '../target.js';
import { TargetMismatchError } from './errors.js';
import { createRowBlock, packStats, trimRowBlock, type RowBlock } from './rowBlock.js';

/** How a hosted chain starts: fresh from the run seed, or from a checkpointed state. */
export type ChainStart =
  | { readonly chain: number; readonly seed: number; readonly init?: readonly number[] }
  | { readonly chain: number; readonly restore: SerialisedChainState };

/** What a host reports while it advances its chains, in order. */
export type HostEvent =
  | { readonly kind: 'rows'; readonly block: RowBlock }
  | { readonly kind: 'snapshot'; readonly chain: number; readonly iteration: number; readonly state: SerialisedChainState }
  | {
      readonly kind: 'progress';
      readonly chain: number;
      readonly iteration: number;
      readonly divergences: number;
      readonly stepSize: number;
    };

/** A chain one host hands over to another: its index and whole state. */
export interface ReleasedChain {
  readonly chain: number;
  readonly state: SerialisedChainState;
}

/** Where each hosted chain stands after {@link ChainHost.advance}. */
export interface ChainStanding {
  readonly chain: number;
  readonly iteration: number;
  readonly adaptation: ChainAdaptation;
  readonly divergences: { readonly warmup: number; readonly sampling: number };
}

/** Options of one {@link ChainHost.advance} call. */
export interface AdvanceRequest {
  /** Run every hosted chain until it has completed this many iterations (warmup included). */
  readonly goal: number;
  /** Emit a snapshot whenever a chain's iteration count is a positive multiple of this (0: never). */
  readonly snapshotEvery: number;
  /** Also emit a snapshot of every chain when it reaches `goal`. */
  readonly snapshotAtGoal: boolean;
}

/** Limits of the slices in which a host takes turns between its chains. */
export interface SliceLimits {
  /** Most iterations of one chain per slice. */
  readonly iterations: number;
  /** A slice also ends after this many seconds. */
  readonly seconds: number;
}

/** Default slice: 100 iterations or 0.2 s, so rows and progress arrive several times a second. */
export const defaultSliceLimits: SliceLimits = { iterations: 100, seconds: 0.2 };

/**
 * Chains advanced by one thread. The same code runs in the calling thread and inside
 * each worker; chains never share state, so a chain's draws do not depend on which
 * host runs it or on what else that host runs.
 */
export interface ChainHost {
  readonly dim: number;
  readonly outputNames: readonly string[];
  /**
   * Runs the chains to `request.goal` in turns of one slice each, yielding to the
   * event loop between slices, and reports rows, snapshots and progress through the
   * host's `emit`. Resolves with every chain's standing; stops early after `stop()`.
   */
  advance(request: AdvanceRequest): Promise<ChainStanding[]>;
  /** Asks a running `advance` to stop after the current iteration. */
  stop(): void;
  /**
   * Hands one chain over to another host, between slices: of the chains short of the
   * current goal, the one with the most iterations left, provided at least two are
   * short of it (so this host keeps working). Returns its state and stops hosting it,
   * or returns null.
   */
  release(): ReleasedChain | null;
  /** Takes over a chain that another host released; the next `advance` runs it. */
  adopt(start: ChainStart): void;
}

function adaptationOf(state: ChainState): ChainAdaptation {
  const m = state.metric;
  return { stepSize: state.stepSize, metric: m.kind === 'unit' ? { kind: 'unit' } : { kind: m.kind, inverseMass: m.inverseMass.slice() } };
}

function startChain(target: Target, settings: ChainSettings, start: ChainStart, ws: ChainWorkspace): ChainState {
  if (!('restore' in start)) return createChainState(target, settings, start.chain, start.seed, start.init, ws);
  const state = restoreChainState(start.restore);
  if (state.chain !== start.chain) {
    throw new TargetMismatchError(`checkpoint state for chain ${start.chain} belongs to chain ${state.chain}`);
  }
  if (state.dim !== target.dim) {
    throw new TargetMismatchError(`chain ${start.chain}: the checkpoint has dim ${state.dim} but the target has dim ${target.dim}`);
  }
  // The same target reproduces the stored log density at the stored position, bit for bit.
  const grad = new Float64Array(target.dim);
  const again = target.logDensityGrad(state.position.slice(), grad);
  if (!Object.is(again, state.logDensity)) {
    throw new TargetMismatchError(
      `chain ${start.chain}: the target gives log density ${again} at the checkpointed position, but the run recorded ${state.logDensity}: this is not the target the run was made with (or it is not deterministic)`,
    );
  }
  return state;
}

/**
 * A host for `starts` on `target`. `emit` receives rows (cut at snapshot points, so a
 * snapshot always follows the rows before it), snapshots and progress.
 */
export function createChainHost(
  target: Target,
  settings: ChainSettings,
  starts: readonly ChainStart[],
  emit: (event: HostEvent) => void,
  slice: SliceLimits = defaultSliceLimits,
): ChainHost {
  const dim = target.dim;
  const outputs = target.outputs;
  const nOut = outputs?.names.length ?? 0;
  const outRow = new Float64Array(nOut);
  const workspaces = starts.map(() => createChainWorkspace(dim, settings));
  const states = starts.map((s, i) => startChain(target, settings, s, workspaces[i]));
  const total = settings.warmup + settings.draws;
  let stopping = false;
  let goal = 0;

  const standing = (): ChainStanding[] =>
    states.map((s) => ({ chain: s.chain, iteration: s.iteration, adaptation: adaptationOf(s), divergences: { ...s.divergences } }));

  const runSlice = (index: number, request: AdvanceRequest): void => {
    const state = states[index];
    const goal = Math.min(request.goal, total);
    const started = performance.now();
    let block = createRowBlock(state.chain, state.iteration, slice.iterations, dim, nOut);
    const flush = (): void => {
      if (block.count > 0) emit({ kind: 'rows', block: trimRowBlock(block, dim, nOut) });
    };
    for (let k = 0; k < slice.iterations && state.iteration < goal && !stopping; k++) {
      const step = advanceChain(target, settings, state, workspaces[index]);
      const row = block.count;
      block.draws.set(step.draw, row * dim);
      packStats(block.stats, row, step.stats);
      if (outputs) {
        outputs.write(step.draw, outRow);
        block.outputs.set(outRow, row * nOut);
      }
      block.count += 1;
      const at = state.iteration;
      const snapshot = (request.snapshotEvery > 0 && at % request.snapshotEvery === 0) || (request.snapshotAtGoal && at === goal);
      if (snapshot) {
        flush();
        emit({ kind: 'snapshot', chain: state.chain, iteration: at, state: serialiseChainState(state) });
        block = createRowBlock(state.chain, at, slice.iterations - k - 1, dim, nOut);
      }
      if ((performance.now() - started) / 1000 >= slice.seconds) break;
    }
    flush();
    emit({
      kind: 'progress',
      chain: state.chain,
      iteration: state.iteration,
      divergences: state.divergences.warmup + state.divergences.sampling,
      stepSize: state.stepSize,
    });
  };

  return {
    dim,
    outputNames: outputs ? [...outputs.names] : [],
    async advance(request: AdvanceRequest): Promise<ChainStanding[]> {
      stopping = false;
      goal = Math.min(request.goal, total);
      for (;;) {
        let busy = false;
        for (let i = 0; i < states.length && !stopping; i++) {
          if (states[i].iteration >= goal) continue;
          runSlice(i, request);
          busy = true;
        }
        if (!busy || stopping) break;
        await new Promise<void>((resolve) => setImmediate(resolve));
      }
      return standing();
    },
    stop(): void {
      stopping = true;
    },
    release() {
      let pick = -1;
      let short = 0;
      for (let i = 0; i < states.length; i++) {
        if (states[i].iteration >= goal) continue;
        short += 1;
        if (pick < 0 || states[i].iteration < states[pick].iteration) pick = i;
      }
      if (short < 2 || stopping) return null;
      const [state] = states.splice(pick, 1);
      workspaces.splice(pick, 1);
      return { chain: state.chain, state: serialiseChainState(state) };
    },
    adopt(start: ChainStart): void {
      const ws = createChainWorkspace(dim, settings);
      states.push(startChain(target, settings, start, ws));
      workspaces.push(ws);
    },
  };
}

import type { Target } from '../target.js';
import type { ChainSettings } from './chainSettings.js';
import { chainPhase, type ChainState } from './chainState.js';
import { createChainWorkspace, type ChainWorkspace } from './chainWorkspace.js';
import { averagedStepSize, recentreDualAveraging, updateDualAveraging } from './dualAveraging.js';
import { ChainStateError } from './errors.js';
import { metricFromCovariance } from './metricFromCovariance.js';
import { nutsTransition } from './nuts.js';
import { hmcTransition } from './staticHmc.js';
import { heuristicStepSize } from './stepSizeHeuristic.js';
import type { TransitionStats } from './transitionStats.js';
import { slowWindowIndex } from './warmupSchedule.js';
import { addToWelford, regularisedCovariance, resetWelford } from './welford.js';

/** What one call of {@link advanceChain} produced. */
export interface ChainStep {
  /** 0-based index of the iteration just run, counting warmup. */
  readonly iteration: number;
  /** Phase the iteration belonged to. */
  readonly phase: 'warmup' | 'sampling';
  /** The new position (a fresh copy, length `dim`), in the target's coordinates. */
  readonly draw: Float64Array;
  readonly stats: TransitionStats;
}

const workspaces = new WeakMap<ChainState, ChainWorkspace>();

function workspaceFor(state: ChainState, settings: ChainSettings): ChainWorkspace {
  let ws = workspaces.get(state);
  const fits =
    ws !== undefined &&
    ws.dim === state.dim &&
    (settings.method === 'nuts'
      ? ws.nuts !== null && ws.nuts.maxTreeDepth >= settings.maxTreeDepth
      : ws.hmc !== null);
  if (!fits) {
    ws = createChainWorkspace(state.dim, settings);
    workspaces.set(state, ws);
  }
  return ws!;
}

/**
 * Runs one iteration of a chain: one transition, then (during warmup) the adaptation
 * that follows it. Mutates `state` in place (position, gradient, log-density, random
 * stream, step size, dual averaging, metric, window accumulator, iteration counter,
 * divergence counts) and returns the draw and its statistics.
 *
 * Warmup iteration t: dual averaging is updated with the transition's acceptance
 * statistic; inside a slow window the new position is accumulated; at the end of a
 * window the metric is re-estimated from it, the step size is re-initialised by the
 * heuristic and dual averaging is re-centred on it (keeping its gain, see
 * `recentreDualAveraging`); after the last warmup iteration the step size is fixed at
 * the dual-averaging average ε̄.
 *
 * `workspace` is scratch memory; when omitted one is created once per state and kept.
 * Throws {@link ChainStateError} when the chain is done or does not match the target.
 */
export function advanceChain(
  target: Target,
  settings: ChainSettings,
  state: ChainState,
  workspace?: ChainWorkspace,
): ChainStep {
  const phase = chainPhase(settings, state);
  if (phase === 'done') {
    throw new ChainStateError(
      `chain ${state.chain}: iteration ${state.iteration} reached warmup + draws = ${settings.warmup + settings.draws}; the chain is done`,
    );
  }
  if (target.dim !== state.dim) {
    throw new ChainStateError(
      `chain ${state.chain}: target.dim = ${target.dim} but the chain state has dim ${state.dim}`,
    );
  }
  const ws = workspace ?? workspaceFor(state, settings);
  const t = state.iteration;
  const stats =
    settings.method === 'nuts'
      ? nutsTransition(target, state.metric, state.rng, state.stepSize, settings.maxTreeDepth, state, ws.nuts!)
      : hmcTransition(target, state.metric, state.rng, state.stepSize, settings.path, settings.jitter, state, ws.hmc!);
  if (stats.divergent) {
    if (phase === 'warmup') state.divergences.warmup += 1;
    else state.divergences.sampling += 1;
  }
  if (phase === 'warmup') adapt(target, settings, state, ws, t, stats.acceptance);
  state.iteration = t + 1;
  return { iteration: t, phase, draw: state.position.slice(), stats };
}

function adapt(
  target: Target,
  settings: ChainSettings,
  state: ChainState,
  ws: ChainWorkspace,
  t: number,
  acceptance: number,
): void {
  state.stepSize = updateDualAveraging(
    state.dualAveraging,
    acceptance,
    settings.targetAcceptance,
    settings.dualAveraging,
  );
  const welford = state.welford;
  const k = welford === null ? -1 : slowWindowIndex(settings.schedule, t);
  if (welford !== null && k >= 0) {
    addToWelford(welford, state.position);
    if (t === settings.schedule.slowWindows[k][1] - 1) {
      // The last window's metric is the one sampling uses: it keeps every correlation
      // (see `regularisedCovariance` on why only earlier windows are shrunk).
      const last = k === settings.schedule.slowWindows.length - 1;
      const covariance = regularisedCovariance(welford, !last);
      resetWelford(welford);
      const metric =
        covariance === null ? null : metricFromCovariance(welford.kind, covariance, state.dim);
      if (metric !== null) state.metric = metric;
      ws.start.position.set(state.position);
      ws.start.gradient.set(state.gradient);
      ws.start.logDensity = state.logDensity;
      state.stepSize = heuristicStepSize(target, state.metric, state.rng, state.stepSize, ws.start, ws.trial);
      state.dualAveraging = recentreDualAveraging(state.dualAveraging, state.stepSize);
    }
  }
  if (t === settings.warmup - 1) state.stepSize = averagedStepSize(state.dualAveraging);
}

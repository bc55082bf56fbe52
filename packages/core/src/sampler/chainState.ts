import { createChainStream, type RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import type { ChainPoint } from './chainPoint.js';
import type { ChainSettings } from './chainSettings.js';
import { createChainWorkspace, type ChainWorkspace } from './chainWorkspace.js';
import { startDualAveraging, type DualAveragingState } from './dualAveraging.js';
import { SamplerOptionsError } from './errors.js';
import { findInitialPosition } from './initialPosition.js';
import { identityMetric, type Metric } from './metric.js';
import { heuristicStepSize } from './stepSizeHeuristic.js';
import { createWelford, type WelfordState } from './welford.js';

/**
 * Everything that determines a chain's future: with the same target and settings,
 * a chain continued from an equal state produces bit-identical draws. Advanced in
 * place by `advanceChain`; converted to JSON-safe data by `serialiseChainState`.
 */
export interface ChainState extends ChainPoint {
  /** Index of the chain in its run (0-based); selects the random stream. */
  readonly chain: number;
  /** Run seed the chain's stream was derived from. */
  readonly seed: number;
  readonly dim: number;
  /** Iterations completed, warmup included (0 … warmup + draws). */
  iteration: number;
  /** Current position in the target's unconstrained coordinates. */
  readonly position: Float64Array;
  /** ∇ log p at `position`. */
  readonly gradient: Float64Array;
  /** log p at `position`. */
  logDensity: number;
  /** Step size for the next transition (after warmup: the adapted one). */
  stepSize: number;
  dualAveraging: DualAveragingState;
  metric: Metric;
  /** Accumulator of the current slow window; null for the unit metric. */
  readonly welford: WelfordState | null;
  readonly rng: RandomStream;
  /** Divergent transitions so far, per phase. */
  readonly divergences: { warmup: number; sampling: number };
}

/** Phases of a chain: adapting, drawing, or finished. */
export type ChainPhase = 'warmup' | 'sampling' | 'done';

/** The phase of the next iteration of `state`. */
export function chainPhase(settings: ChainSettings, state: ChainState): ChainPhase {
  if (state.iteration < settings.warmup) return 'warmup';
  if (state.iteration < settings.warmup + settings.draws) return 'sampling';
  return 'done';
}

/**
 * A new chain: its random stream from (`seed`, `chain`), a starting position (`init`
 * or uniform in (−2, 2), retried while the density or gradient is not finite), the
 * identity metric and an initial step size (the Hoffman & Gelman 2014 heuristic from
 * `settings.initialStepSize` or 1; with no warmup and a given initial step size, that
 * step size as is).
 */
export function createChainState(
  target: Target,
  settings: ChainSettings,
  chain: number,
  seed: number,
  init?: ArrayLike<number>,
  workspace?: ChainWorkspace,
): ChainState {
  if (!Number.isInteger(target.dim) || target.dim < 1) {
    throw new SamplerOptionsError(`target.dim = ${String(target.dim)}: expected an integer >= 1`);
  }
  const dim = target.dim;
  const rng = createChainStream(seed, chain);
  const position = new Float64Array(dim);
  const gradient = new Float64Array(dim);
  const logDensity = findInitialPosition(target, rng, chain, position, gradient, init);
  const metric = identityMetric(settings.metric, dim);
  let stepSize = settings.initialStepSize ?? 1;
  if (settings.warmup > 0 || settings.initialStepSize === null) {
    const ws = workspace ?? createChainWorkspace(dim, settings);
    ws.start.position.set(position);
    ws.start.gradient.set(gradient);
    ws.start.logDensity = logDensity;
    stepSize = heuristicStepSize(target, metric, rng, stepSize, ws.start, ws.trial);
  }
  return {
    chain,
    seed,
    dim,
    iteration: 0,
    position,
    gradient,
    logDensity,
    stepSize,
    dualAveraging: startDualAveraging(stepSize),
    metric,
    welford: settings.metric === 'unit' ? null : createWelford(settings.metric, dim),
    rng,
    divergences: { warmup: 0, sampling: 0 },
  };
}

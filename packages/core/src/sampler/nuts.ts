import type { RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import type { ChainPoint } from './chainPoint.js';
import { leapfrogStep } from './leapfrog.js';
import { applyInverseMass, drawMomentum, kineticEnergy, type Metric } from './metric.js';
import { copyPhasePoint, createPhasePoint, type PhasePoint } from './phasePoint.js';
import type { TransitionStats } from './transitionStats.js';
import { mergeSegments } from './uTurn.js';

/** Energy error H − H₀ above which a trajectory is called divergent (common practice). */
export const divergenceThreshold = 1000;

/** A candidate draw: the state a transition may return. */
interface SampleSlot {
  readonly position: Float64Array;
  readonly gradient: Float64Array;
  logDensity: number;
  kinetic: number;
}

/**
 * What one subtree of a given depth hands to its parent. The arrays are swapped
 * between neighbouring levels (never copied) when halves are merged.
 */
interface TreeLevel {
  /** Sum of momenta over the subtree. */
  rho: Float64Array;
  /** Momentum and velocity at the subtree's first point (nearest the trajectory start). */
  innerP: Float64Array;
  innerV: Float64Array;
  /** Momentum and velocity at the subtree's last point. */
  outerP: Float64Array;
  outerV: Float64Array;
  /** During a merge: the last point of the first half. */
  midP: Float64Array;
  midV: Float64Array;
}

/**
 * Preallocated buffers for NUTS transitions of one dimension and maximum depth.
 * Reused across transitions; holds no state that matters between them.
 */
export interface NutsWorkspace {
  readonly dim: number;
  readonly maxTreeDepth: number;
  readonly levels: TreeLevel[];
  readonly backward: PhasePoint;
  readonly forward: PhasePoint;
  sample: SampleSlot;
  candidate: SampleSlot;
  readonly rho: Float64Array;
  readonly nearP: Float64Array;
  readonly nearV: Float64Array;
  // Per-transition scratch values.
  target: Target | null;
  metric: Metric | null;
  rng: RandomStream | null;
  h0: number;
  subtreeLogWeight: number;
  leapfrogSteps: number;
  acceptanceSum: number;
  divergent: boolean;
}

function createSlot(dim: number): SampleSlot {
  return { position: new Float64Array(dim), gradient: new Float64Array(dim), logDensity: 0, kinetic: 0 };
}

/** Buffers for NUTS in `dim` dimensions with trees of at most `maxTreeDepth` doublings. */
export function createNutsWorkspace(dim: number, maxTreeDepth: number): NutsWorkspace {
  const v = (): Float64Array => new Float64Array(dim);
  const levels: TreeLevel[] = [];
  for (let k = 0; k < maxTreeDepth; k++) {
    levels.push({ rho: v(), innerP: v(), innerV: v(), outerP: v(), outerV: v(), midP: v(), midV: v() });
  }
  return {
    dim,
    maxTreeDepth,
    levels,
    backward: createPhasePoint(dim),
    forward: createPhasePoint(dim),
    sample: createSlot(dim),
    candidate: createSlot(dim),
    rho: v(),
    nearP: v(),
    nearV: v(),
    target: null,
    metric: null,
    rng: null,
    h0: 0,
    subtreeLogWeight: -Infinity,
    leapfrogSteps: 0,
    acceptanceSum: 0,
    divergent: false,
  };
}

function logAddExp(a: number, b: number): number {
  if (a === -Infinity) return b;
  if (b === -Infinity) return a;
  return a > b ? a + Math.log1p(Math.exp(b - a)) : b + Math.log1p(Math.exp(a - b));
}

function takeSample(point: PhasePoint, slot: SampleSlot): void {
  slot.position.set(point.position);
  slot.gradient.set(point.gradient);
  slot.logDensity = point.logDensity;
  slot.kinetic = point.kinetic;
}

/**
 * Extends the trajectory by 2^depth leapfrog steps from `point` (moved in place) with
 * signed step `eps`, and leaves the subtree's summary in `ws.levels[depth]` and its
 * multinomial draw in `ws.candidate`. Returns false when the subtree diverged or
 * made a U-turn inside itself; the caller must then discard it.
 */
function buildSubtree(ws: NutsWorkspace, depth: number, point: PhasePoint, eps: number): boolean {
  if (depth === 0) {
    leapfrogStep(ws.target!, ws.metric!, eps, point);
    ws.leapfrogSteps += 1;
    const energyError = point.kinetic - point.logDensity - ws.h0;
    if (!(energyError <= divergenceThreshold)) {
      ws.divergent = true;
      return false;
    }
    ws.acceptanceSum += energyError > 0 ? Math.exp(-energyError) : 1;
    // Multinomial draw within the subtree by weighted reservoir sampling: each point is
    // kept with probability weight / (weight of the subtree so far).
    const logWeight = -energyError;
    const total = logAddExp(ws.subtreeLogWeight, logWeight);
    ws.subtreeLogWeight = total;
    if (logWeight >= total || ws.rng!.uniform() < Math.exp(logWeight - total)) {
      takeSample(point, ws.candidate);
    }
    const leaf = ws.levels[0];
    leaf.rho.set(point.momentum);
    leaf.innerP.set(point.momentum);
    leaf.innerV.set(point.velocity);
    leaf.outerP.set(point.momentum);
    leaf.outerV.set(point.velocity);
    return true;
  }
  const level = ws.levels[depth];
  const half = ws.levels[depth - 1];
  if (!buildSubtree(ws, depth - 1, point, eps)) return false;
  // Keep the first half's summary at this level; `half` is then free for the second.
  let t = level.rho;
  level.rho = half.rho;
  half.rho = t;
  t = level.innerP;
  level.innerP = half.innerP;
  half.innerP = t;
  t = level.innerV;
  level.innerV = half.innerV;
  half.innerV = t;
  t = level.midP;
  level.midP = half.outerP;
  half.outerP = t;
  t = level.midV;
  level.midV = half.outerV;
  half.outerV = t;
  if (!buildSubtree(ws, depth - 1, point, eps)) return false;
  // Merge the halves: the whole subtree, and (above depth 1, where they would repeat
  // that check) the first half plus the second's first point and the first half's last
  // point plus the second half.
  const persists = mergeSegments(
    level.rho,
    half.rho,
    level.innerV,
    level.midP,
    level.midV,
    half.innerP,
    half.innerV,
    half.outerV,
    depth > 1,
  );
  t = level.outerP;
  level.outerP = half.outerP;
  half.outerP = t;
  t = level.outerV;
  level.outerV = half.outerV;
  half.outerV = t;
  return persists;
}

/**
 * One NUTS transition (Hoffman & Gelman 2014) with multinomial sampling over the
 * trajectory and the generalized no-U-turn criterion (Betancourt 2017,
 * arXiv:1701.02434), including the checks across merged subtrees. Each doubling
 * picks a direction at random; a valid new subtree replaces the current draw with
 * probability min(1, W_new / W_old) (biased progressive sampling). A subtree that
 * diverges (energy error above 1000 or a non-finite value) or turns back on itself
 * ends the trajectory and is discarded.
 *
 * Moves `current` (position, gradient, log-density) in place to the new draw.
 */
export function nutsTransition(
  target: Target,
  metric: Metric,
  rng: RandomStream,
  stepSize: number,
  maxTreeDepth: number,
  current: ChainPoint,
  ws: NutsWorkspace,
): TransitionStats {
  if (maxTreeDepth > ws.maxTreeDepth) {
    throw new RangeError(`maxTreeDepth = ${maxTreeDepth} exceeds the workspace's ${ws.maxTreeDepth}`);
  }
  ws.target = target;
  ws.metric = metric;
  ws.rng = rng;
  ws.leapfrogSteps = 0;
  ws.acceptanceSum = 0;
  ws.divergent = false;

  const start = ws.backward;
  start.position.set(current.position);
  start.gradient.set(current.gradient);
  start.logDensity = current.logDensity;
  applyInverseMass(metric, start.gradient, start.scaledGradient);
  drawMomentum(metric, rng, start.momentum, start.velocity);
  start.kinetic = kineticEnergy(start.momentum, start.velocity);
  copyPhasePoint(start, ws.forward);
  ws.h0 = start.kinetic - start.logDensity;
  takeSample(start, ws.sample);
  ws.rho.set(start.momentum);
  let logWeight = 0; // weight of the initial point, exp(H₀ − H₀)

  let treeDepth = 0;
  for (let depth = 0; depth < maxTreeDepth; depth++) {
    const goForward = rng.uniform() >= 0.5;
    const end = goForward ? ws.forward : ws.backward;
    const other = goForward ? ws.backward : ws.forward;
    ws.nearP.set(end.momentum);
    ws.nearV.set(end.velocity);
    ws.subtreeLogWeight = -Infinity;
    const valid = buildSubtree(ws, depth, end, goForward ? stepSize : -stepSize);
    treeDepth = depth + 1;
    if (!valid) break;

    const w = ws.subtreeLogWeight;
    if (w >= logWeight || rng.uniform() < Math.exp(w - logWeight)) {
      const s = ws.sample;
      ws.sample = ws.candidate;
      ws.candidate = s;
    }
    logWeight = logAddExp(logWeight, w);

    const level = ws.levels[depth];
    // The old trajectory (far end `other`, near end saved in nearP/nearV) merged with
    // the new subtree (first point level.inner, last point `end`).
    const persists = mergeSegments(
      ws.rho,
      level.rho,
      other.velocity,
      ws.nearP,
      ws.nearV,
      level.innerP,
      level.innerV,
      end.velocity,
      depth > 0,
    );
    if (!persists) break;
  }

  const chosen = ws.sample;
  current.position.set(chosen.position);
  current.gradient.set(chosen.gradient);
  current.logDensity = chosen.logDensity;
  ws.target = null;
  ws.metric = null;
  ws.rng = null;
  return {
    stepSize,
    treeDepth,
    leapfrogSteps: ws.leapfrogSteps,
    divergent: ws.divergent,
    energy: chosen.kinetic - chosen.logDensity,
    acceptance: ws.acceptanceSum / ws.leapfrogSteps,
    logDensity: chosen.logDensity,
  };
}

import type { RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import type { ChainPoint } from './chainPoint.js';
import { leapfrogStep } from './leapfrog.js';
import { applyInverseMass, drawMomentum, kineticEnergy, type Metric } from './metric.js';
import { copyPhasePoint, createPhasePoint, type PhasePoint } from './phasePoint.js';
import type { TransitionStats } from './transitionStats.js';
import { createMergeInputs, mergeChain, type MergeInputs } from './uTurn.js';

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
 * Preallocated buffers for NUTS transitions of one dimension and maximum depth.
 * Reused across transitions; holds no state that matters between them.
 *
 * A doubling of depth D adds 2^D points, numbered 0 … 2^D − 1 from the trajectory
 * end it grows from. After point j, the merges of the binary tree that end at j are
 * made at once (tz(j + 1) of them, the number of trailing zero bits; plus the merge
 * with the old trajectory after the last point). What later merges need from point j
 * is kept in slots indexed by level, which no later point overwrites before it is used:
 * - an even point j starts the subtrees of levels 1 … t (t = tz(j), or D for j = 0) and
 *   the second half of the level-(t + 1) subtree: its momentum and velocity go to
 *   `startP[t]`, `startV[t]` (the momentum is also the summed momentum of the single
 *   point that is the first half of a level-1 merge);
 * - an odd point j ends the first half of the level-(m + 1) subtree (m = tz(j + 1)):
 *   its momentum and velocity go to `endP[m]`, `endV[m]`, and the summed momentum of
 *   the level-m subtree it completes to `rhoFirst[m]`.
 */
export interface NutsWorkspace {
  readonly dim: number;
  readonly maxTreeDepth: number;
  readonly startP: Float64Array[];
  readonly startV: Float64Array[];
  readonly endP: Float64Array[];
  readonly endV: Float64Array[];
  readonly rhoFirst: Float64Array[];
  /** Inputs of the merges completing at the current point, level 1 first. */
  readonly merges: MergeInputs[];
  readonly backward: PhasePoint;
  readonly forward: PhasePoint;
  sample: SampleSlot;
  candidate: SampleSlot;
  /** Summed momentum of the whole trajectory so far. */
  readonly rho: Float64Array;
  /** Momentum and velocity at the old trajectory's end that a doubling grows from. */
  readonly nearP: Float64Array;
  readonly nearV: Float64Array;
  readonly scratch: Float64Array;
  // Per-transition scratch values.
  target: Target | null;
  metric: Metric | null;
  rng: RandomStream | null;
  h0: number;
  subtreeLogWeight: number;
  leapfrogSteps: number;
  acceptanceSum: number;
  divergent: boolean;
  /** Whether the last doubling's merge with the old trajectory passed its checks. */
  persists: boolean;
}

function createSlot(dim: number): SampleSlot {
  return { position: new Float64Array(dim), gradient: new Float64Array(dim), logDensity: 0, kinetic: 0 };
}

/** Buffers for NUTS in `dim` dimensions with trees of at most `maxTreeDepth` doublings. */
export function createNutsWorkspace(dim: number, maxTreeDepth: number): NutsWorkspace {
  const v = (): Float64Array => new Float64Array(dim);
  const perLevel = (): Float64Array[] => Array.from({ length: maxTreeDepth + 1 }, v);
  return {
    dim,
    maxTreeDepth,
    startP: perLevel(),
    startV: perLevel(),
    endP: perLevel(),
    endV: perLevel(),
    rhoFirst: perLevel(),
    merges: Array.from({ length: maxTreeDepth + 1 }, createMergeInputs),
    backward: createPhasePoint(dim),
    forward: createPhasePoint(dim),
    sample: createSlot(dim),
    candidate: createSlot(dim),
    rho: v(),
    nearP: v(),
    nearV: v(),
    scratch: v(),
    target: null,
    metric: null,
    rng: null,
    h0: 0,
    subtreeLogWeight: -Infinity,
    leapfrogSteps: 0,
    acceptanceSum: 0,
    divergent: false,
    persists: false,
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

/** Number of trailing zero bits of a positive 32-bit integer. */
function trailingZeros(x: number): number {
  return 31 - Math.clz32(x & -x);
}

/**
 * Adds 2^depth leapfrog steps to the trajectory from its end `point` (moved in place)
 * with signed step `eps`, making every merge of the new subtree's binary tree as soon
 * as its last point exists, and finally the merge of the old trajectory (summed
 * momentum `ws.rho`, far-end velocity `farVelocity`, near end in `ws.nearP`/`ws.nearV`)
 * with the new subtree, whose result is left in `ws.persists` and whose summed momentum
 * replaces `ws.rho`. The subtree's multinomial draw is left in `ws.candidate` and its
 * log-weight in `ws.subtreeLogWeight`.
 *
 * Returns false when the subtree diverged or made a U-turn inside itself; the caller
 * must then discard it. Points, random draws and checks come in the same order as in
 * the recursive formulation (each half of a subtree built before the halves are merged).
 */
function extendTrajectory(
  ws: NutsWorkspace,
  depth: number,
  point: PhasePoint,
  eps: number,
  farVelocity: Float64Array,
): boolean {
  const target = ws.target!;
  const metric = ws.metric!;
  const rng = ws.rng!;
  const h0 = ws.h0;
  const { startP, startV, endP, endV, rhoFirst, merges } = ws;
  const count = 2 ** depth;
  for (let j = 0; j < count; j++) {
    leapfrogStep(target, metric, eps, point);
    ws.leapfrogSteps += 1;
    const energyError = point.kinetic - point.logDensity - h0;
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
    if (logWeight >= total || rng.uniform() < Math.exp(logWeight - total)) {
      takeSample(point, ws.candidate);
    }
    const last = j === count - 1;
    if ((j & 1) === 0 && !last) {
      const t = j === 0 ? depth : trailingZeros(j);
      startP[t].set(point.momentum);
      startV[t].set(point.velocity);
      continue;
    }
    // Merges ending at point j: levels 1 … m of the subtree, then (after the last
    // point) the old trajectory with the whole subtree.
    const m = trailingZeros(j + 1);
    for (let k = 1; k <= m; k++) {
      const l = merges[k - 1];
      const first = j + 1 - 2 ** k;
      const t = first === 0 ? depth : trailingZeros(first);
      l.vFirstStart = startV[t];
      if (k === 1) {
        l.rhoFirst = startP[t];
      } else {
        l.rhoFirst = rhoFirst[k - 1];
        l.pFirstEnd = endP[k - 1];
        l.vFirstEnd = endV[k - 1];
        l.pSecondStart = startP[k - 1];
        l.vSecondStart = startV[k - 1];
      }
    }
    if (last) {
      const l = merges[m];
      l.rhoFirst = ws.rho;
      l.vFirstStart = farVelocity;
      l.pFirstEnd = ws.nearP;
      l.vFirstEnd = ws.nearV;
      l.pSecondStart = startP[depth];
      l.vSecondStart = startV[depth];
      const held = mergeChain(merges, m + 1, point.momentum, point.velocity, ws.rho, ws.scratch);
      if (held < m) return false;
      ws.persists = held === m + 1;
      return true;
    }
    const held = mergeChain(merges, m, point.momentum, point.velocity, rhoFirst[m], ws.scratch);
    if (held < m) return false;
    if (m > 2) {
      // mergeChain left the sum in rhoFirst[m − 1], whose old content is used up.
      const t = rhoFirst[m];
      rhoFirst[m] = rhoFirst[m - 1];
      rhoFirst[m - 1] = t;
    }
    endP[m].set(point.momentum);
    endV[m].set(point.velocity);
  }
  return true;
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
    const valid = extendTrajectory(ws, depth, end, goForward ? stepSize : -stepSize, other.velocity);
    treeDepth = depth + 1;
    if (!valid) break;

    const w = ws.subtreeLogWeight;
    if (w >= logWeight || rng.uniform() < Math.exp(w - logWeight)) {
      const s = ws.sample;
      ws.sample = ws.candidate;
      ws.candidate = s;
    }
    logWeight = logAddExp(logWeight, w);
    // The old trajectory merged with the new subtree (checked in extendTrajectory).
    if (!ws.persists) break;
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

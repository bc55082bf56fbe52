import type { RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import type { ChainPoint } from './chainPoint.js';
import { leapfrogStep, slabKick, slabKickDrift, slabKickDriftNext } from './leapfrog.js';
import { applyInverseMass, drawMomentum, kineticEnergy, type Metric } from './metric.js';
import { copyPhasePoint, type PhasePoint } from './phasePoint.js';
import type { TransitionStats } from './transitionStats.js';
import {
  createMergeInputs,
  createSlabMerge,
  mergeChain,
  slabKickMergePair,
  slabKickMergePairDrift,
  slabKickMergePoint,
  slabKickMergePointDrift,
  slabMergeAcross,
  type KickEnergy,
  type MergeInputs,
  type SlabMerge,
} from './uTurn.js';

/** Energy error H − H₀ above which a trajectory is called divergent (common practice). */
export const divergenceThreshold = 1000;

/** A candidate draw: the state a transition may return. */
interface SampleSlot {
  readonly position: Float64Array;
  readonly gradient: Float64Array;
  logDensity: number;
  kinetic: number;
}

/** Offsets in the slab of one trajectory end's vectors. */
interface EndOffsets {
  readonly q: number;
  readonly g: number;
  readonly p: number;
  readonly v: number;
  /** A second position vector: steps alternate between `q` and this one (diagonal metric). */
  readonly qAlt: number;
  /** A view of `qAlt`. */
  readonly qAltView: Float64Array;
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
 *
 * Every vector of length dim lives in one Float64Array, `slab`; the typed arrays below
 * are views into it, and the `*At` numbers are the same vectors' offsets, which the
 * diagonal-metric kernels use (see leapfrog.ts for why).
 */
export interface NutsWorkspace {
  readonly dim: number;
  readonly maxTreeDepth: number;
  readonly slab: Float64Array;
  readonly startP: Float64Array[];
  readonly startV: Float64Array[];
  readonly endP: Float64Array[];
  readonly endV: Float64Array[];
  readonly rhoFirst: Float64Array[];
  readonly startPAt: Int32Array;
  readonly startVAt: Int32Array;
  readonly endPAt: Int32Array;
  readonly endVAt: Int32Array;
  readonly rhoFirstAt: Int32Array;
  /** Inputs of the merges completing at the current point, level 1 first (arrays, and offsets). */
  readonly merges: MergeInputs[];
  readonly slabMerges: SlabMerge[];
  readonly backward: PhasePoint;
  readonly forward: PhasePoint;
  readonly backwardAt: EndOffsets;
  readonly forwardAt: EndOffsets;
  sample: SampleSlot;
  candidate: SampleSlot;
  /** Summed momentum of the whole trajectory so far. */
  readonly rho: Float64Array;
  /** Momentum and velocity at the old trajectory's end that a doubling grows from. */
  readonly nearP: Float64Array;
  readonly nearV: Float64Array;
  readonly scratch: Float64Array;
  readonly rhoAt: number;
  readonly nearPAt: number;
  readonly nearVAt: number;
  readonly scratchAt: number;
  /** Half-step momentum between the two halves of a leapfrog step (diagonal metric). */
  readonly halfAt: number;
  /** The diagonal inverse mass, copied into the slab for each transition. */
  readonly inverseMassAt: number;
  readonly energy: KickEnergy;
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
  const levels = maxTreeDepth + 1;
  // Vectors: 5 per level, 12 for the two ends, rho, nearP, nearV, scratch, half, inverse mass.
  const slab = new Float64Array(dim * (5 * levels + 18));
  let next = 0;
  const take = (): number => {
    const at = next;
    next += dim;
    return at;
  };
  const view = (at: number): Float64Array => slab.subarray(at, at + dim);
  const perLevel = (): Int32Array => Int32Array.from({ length: levels }, take);
  const startPAt = perLevel();
  const startVAt = perLevel();
  const endPAt = perLevel();
  const endVAt = perLevel();
  const rhoFirstAt = perLevel();
  const end = (): { point: PhasePoint; at: EndOffsets } => {
    const q = take();
    const g = take();
    const p = take();
    const v = take();
    const qAlt = take();
    const at = { q, g, p, v, qAlt, qAltView: view(qAlt) };
    const point: PhasePoint = {
      position: view(at.q),
      momentum: view(at.p),
      velocity: view(at.v),
      gradient: view(at.g),
      scaledGradient: view(take()),
      logDensity: 0,
      kinetic: 0,
    };
    return { point, at };
  };
  const backward = end();
  const forward = end();
  const rhoAt = take();
  const nearPAt = take();
  const nearVAt = take();
  const scratchAt = take();
  return {
    dim,
    maxTreeDepth,
    slab,
    startP: Array.from(startPAt, view),
    startV: Array.from(startVAt, view),
    endP: Array.from(endPAt, view),
    endV: Array.from(endVAt, view),
    rhoFirst: Array.from(rhoFirstAt, view),
    startPAt,
    startVAt,
    endPAt,
    endVAt,
    rhoFirstAt,
    merges: Array.from({ length: levels }, createMergeInputs),
    slabMerges: Array.from({ length: levels }, createSlabMerge),
    backward: backward.point,
    forward: forward.point,
    backwardAt: backward.at,
    forwardAt: forward.at,
    sample: createSlot(dim),
    candidate: createSlot(dim),
    rho: view(rhoAt),
    nearP: view(nearPAt),
    nearV: view(nearVAt),
    scratch: view(scratchAt),
    rhoAt,
    nearPAt,
    nearVAt,
    scratchAt,
    halfAt: take(),
    inverseMassAt: take(),
    energy: { twiceKinetic: 0 },
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
 * momentum `ws.rho`, far end `far`, near end in `ws.nearP`/`ws.nearV`) with the new
 * subtree, whose result is left in `ws.persists` and whose summed momentum replaces
 * `ws.rho`. The subtree's multinomial draw is left in `ws.candidate` and its log-weight
 * in `ws.subtreeLogWeight`.
 *
 * Returns false when the subtree diverged or made a U-turn inside itself; the caller
 * must then discard it. Points, random draws and checks come in the same order as in
 * the recursive formulation (each half of a subtree built before the halves are merged).
 */
function extendTrajectory(
  ws: NutsWorkspace,
  depth: number,
  point: PhasePoint,
  at: EndOffsets,
  eps: number,
  far: PhasePoint,
  farAt: EndOffsets,
): boolean {
  if (ws.metric!.kind === 'diagonal') return extendDiagonal(ws, depth, point, at, eps, farAt.v);
  const target = ws.target!;
  const metric = ws.metric!;
  const { startP, startV, endP, endV, rhoFirst, merges } = ws;
  const count = 1 << depth;
  for (let j = 0; j < count; j++) {
    leapfrogStep(target, metric, eps, point);
    if (!acceptPoint(ws, point)) return false;
    const last = j === count - 1;
    if ((j & 1) === 0 && !last) {
      const t = j === 0 ? depth : trailingZeros(j);
      startP[t].set(point.momentum);
      startV[t].set(point.velocity);
      continue;
    }
    // Merges ending at point j: levels 1 … m of the subtree, then (after the last
    // point) the old trajectory with the whole subtree.
    const m = fillMerges(ws, j, depth, last, far.velocity);
    if (last) {
      const held = mergeChain(merges, m + 1, point.momentum, point.velocity, ws.rho, ws.scratch);
      if (held < m) return false;
      ws.persists = held === m + 1;
      return true;
    }
    const held = mergeChain(merges, m, point.momentum, point.velocity, rhoFirst[m], ws.scratch);
    if (held < m) return false;
    if (m > 2) swapSums(ws, m);
    endP[m].set(point.momentum);
    endV[m].set(point.velocity);
  }
  return true;
}

/**
 * {@link extendTrajectory} for a diagonal metric, with the same arithmetic in fewer
 * passes over the slab: the second half-kick of each leapfrog step writes the new
 * momentum and velocity straight into the slot where the point is kept (so nothing is
 * copied; the next step's first half reads them there) and makes the point's level-1
 * and level-2 merges in the same pass. The end point's own momentum and velocity are
 * written by the last step only.
 */
function extendDiagonal(
  ws: NutsWorkspace,
  depth: number,
  point: PhasePoint,
  at: EndOffsets,
  eps: number,
  farV: number,
): boolean {
  const target = ws.target!;
  const { slab, startPAt, startVAt, endPAt, endVAt, rhoFirstAt, energy } = ws;
  const n = ws.dim;
  const half = ws.halfAt;
  const mass = ws.inverseMassAt;
  const g = at.g;
  const count = 1 << depth;
  // The position alternates between the end's own vector and its second one: each
  // step's second half-kick also makes the next step's first half and drift, writing the
  // next position beside the current one (which the draw may still take).
  let q = at.q;
  let qNext = at.qAlt;
  let position = point.position;
  let positionNext = at.qAltView;
  slabKickDrift(slab, n, at.p, g, mass, q, half, eps);
  for (let j = 0; j < count; j++) {
    point.logDensity = target.logDensityGrad(position, point.gradient);
    const last = j === count - 1;
    if ((j & 1) === 0 && !last) {
      const t = j === 0 ? depth : trailingZeros(j);
      point.kinetic = 0.5 * slabKickDriftNext(slab, n, half, g, mass, eps, startPAt[t], startVAt[t], q, qNext);
      if (!acceptPoint(ws, point, position)) return false;
    } else if (last) {
      const m = fillSlabMerges(ws, j, depth, true, farV);
      const held = kickMerging(ws, g, eps, at.p, at.v, m + 1, ws.rhoAt);
      point.kinetic = 0.5 * energy.twiceKinetic;
      if (!acceptPoint(ws, point, position)) return false;
      if (held < m) return false;
      if (q !== at.q) point.position.set(position);
      ws.persists = held === m + 1;
      return true;
    } else {
      const m = fillSlabMerges(ws, j, depth, false, farV);
      const held = kickMergingDrift(ws, g, eps, endPAt[m], endVAt[m], m, rhoFirstAt[m], q, qNext);
      point.kinetic = 0.5 * energy.twiceKinetic;
      if (!acceptPoint(ws, point, position)) return false;
      if (held < m) return false;
      if (m > 2) swapSums(ws, m);
    }
    const tq = q;
    q = qNext;
    qNext = tq;
    const tv = position;
    position = positionNext;
    positionNext = tv;
  }
  return true;
}

/**
 * The second half-kick fused with the `count` merges ending at the new point (levels 1
 * and 2 in the kick's pass, further levels by one pass each). The last level's sum goes
 * to `out` for count ≤ 2, else it is left at that level's `rhoFirst`. Returns how many
 * levels pass, from level 1 up.
 */
function kickMerging(ws: NutsWorkspace, g: number, eps: number, pOut: number, vOut: number, count: number, out: number): number {
  const { slab, slabMerges, energy } = ws;
  const n = ws.dim;
  if (count === 1) {
    return slabKickMergePoint(slab, n, ws.halfAt, g, ws.inverseMassAt, eps, pOut, vOut, energy, slabMerges[0], out);
  }
  const held = slabKickMergePair(slab, n, ws.halfAt, g, ws.inverseMassAt, eps, pOut, vOut, energy, slabMerges[0], slabMerges[1], count === 2 ? out : ws.scratchAt);
  if (count === 2 || held < 2) return held;
  let second = ws.scratchAt;
  for (let k = 2; k < count; k++) {
    const l = slabMerges[k];
    if (!slabMergeAcross(slab, n, l, second, vOut)) return k;
    second = l.rhoFirst;
  }
  return count;
}

/** {@link kickMerging} fused also with the next step's first half and drift (into `qNext`). */
function kickMergingDrift(ws: NutsWorkspace, g: number, eps: number, pOut: number, vOut: number, count: number, out: number, q: number, qNext: number): number {
  const { slab, slabMerges, energy } = ws;
  const n = ws.dim;
  if (count === 1) {
    return slabKickMergePointDrift(slab, n, ws.halfAt, g, ws.inverseMassAt, eps, pOut, vOut, energy, slabMerges[0], out, q, qNext);
  }
  const held = slabKickMergePairDrift(slab, n, ws.halfAt, g, ws.inverseMassAt, eps, pOut, vOut, energy, slabMerges[0], slabMerges[1], count === 2 ? out : ws.scratchAt, q, qNext);
  if (count === 2 || held < 2) return held;
  let second = ws.scratchAt;
  for (let k = 2; k < count; k++) {
    const l = slabMerges[k];
    if (!slabMergeAcross(slab, n, l, second, vOut)) return k;
    second = l.rhoFirst;
  }
  return count;
}

/**
 * Counts a new trajectory point and checks it: false when it diverged (energy error
 * above the threshold or not finite); otherwise adds its acceptance statistic and makes
 * the multinomial draw within the subtree by weighted reservoir sampling (the point is
 * kept with probability weight / (weight of the subtree so far)).
 */
function acceptPoint(ws: NutsWorkspace, point: PhasePoint, position: Float64Array = point.position): boolean {
  ws.leapfrogSteps += 1;
  const energyError = point.kinetic - point.logDensity - ws.h0;
  if (!(energyError <= divergenceThreshold)) {
    ws.divergent = true;
    return false;
  }
  ws.acceptanceSum += energyError > 0 ? Math.exp(-energyError) : 1;
  const logWeight = -energyError;
  const total = logAddExp(ws.subtreeLogWeight, logWeight);
  ws.subtreeLogWeight = total;
  if (logWeight >= total || ws.rng!.uniform() < Math.exp(logWeight - total)) {
    const slot = ws.candidate;
    slot.position.set(position);
    slot.gradient.set(point.gradient);
    slot.logDensity = point.logDensity;
    slot.kinetic = point.kinetic;
  }
  return true;
}

/**
 * Points `ws.merges` at the inputs of the merges ending at point j (odd, or the last):
 * levels 1 … m of the subtree (m = tz(j + 1)) and, for the last point, the merge of the
 * old trajectory with the whole subtree at index m. Returns m.
 */
function fillMerges(ws: NutsWorkspace, j: number, depth: number, last: boolean, farVelocity: Float64Array): number {
  const { startP, startV, endP, endV, rhoFirst, merges } = ws;
  const m = trailingZeros(j + 1);
  for (let k = 1; k <= m; k++) {
    const l = merges[k - 1];
    const first = j + 1 - (1 << k);
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
  }
  return m;
}

/** {@link fillMerges} with slab offsets, into `ws.slabMerges`. */
function fillSlabMerges(ws: NutsWorkspace, j: number, depth: number, last: boolean, farV: number): number {
  const { startPAt, startVAt, endPAt, endVAt, rhoFirstAt, slabMerges } = ws;
  const m = trailingZeros(j + 1);
  for (let k = 1; k <= m; k++) {
    const l = slabMerges[k - 1];
    const first = j + 1 - (1 << k);
    const t = first === 0 ? depth : trailingZeros(first);
    l.vFirstStart = startVAt[t];
    if (k === 1) {
      l.rhoFirst = startPAt[t];
    } else {
      l.rhoFirst = rhoFirstAt[k - 1];
      l.pFirstEnd = endPAt[k - 1];
      l.vFirstEnd = endVAt[k - 1];
      l.pSecondStart = startPAt[k - 1];
      l.vSecondStart = startVAt[k - 1];
    }
  }
  if (last) {
    const l = slabMerges[m];
    l.rhoFirst = ws.rhoAt;
    l.vFirstStart = farV;
    l.pFirstEnd = ws.nearPAt;
    l.vFirstEnd = ws.nearVAt;
    l.pSecondStart = startPAt[depth];
    l.vSecondStart = startVAt[depth];
  }
  return m;
}

/**
 * After a merge chain of m > 2 levels its sum is in rhoFirst[m − 1] (used up): swap
 * the slots m − 1 and m (views and offsets alike).
 */
function swapSums(ws: NutsWorkspace, m: number): void {
  const { rhoFirst, rhoFirstAt } = ws;
  const t = rhoFirst[m];
  rhoFirst[m] = rhoFirst[m - 1];
  rhoFirst[m - 1] = t;
  const o = rhoFirstAt[m];
  rhoFirstAt[m] = rhoFirstAt[m - 1];
  rhoFirstAt[m - 1] = o;
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
  if (metric.kind === 'diagonal') ws.slab.set(metric.inverseMass, ws.inverseMassAt);

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
    const valid = extendTrajectory(
      ws,
      depth,
      end,
      goForward ? ws.forwardAt : ws.backwardAt,
      goForward ? stepSize : -stepSize,
      other,
      goForward ? ws.backwardAt : ws.forwardAt,
    );
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

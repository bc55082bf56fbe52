/**
 * Generalized no-U-turn criterion (Betancourt 2017, arXiv:1701.02434, sec. 4.2 and
 * appendix A.4.2): a trajectory with summed momentum ρ and velocities v⁻, v⁺ (M⁻¹ p
 * at its two ends) may keep growing while ρ·v⁻ > 0 and ρ·v⁺ > 0.
 *
 * `extra`, when given, is added to ρ first: (ρ + extra)·v. That is how the checks
 * across two merged subtrees (a subtree plus the first point of its neighbour) are
 * made without a temporary vector. Returns false for NaN.
 */
export function trajectoryPersists(
  rho: Float64Array,
  extra: Float64Array | null,
  velocityA: Float64Array,
  velocityB: Float64Array,
): boolean {
  const n = rho.length;
  let a = 0;
  let b = 0;
  if (extra === null) {
    for (let i = 0; i < n; i++) {
      const r = rho[i];
      a += r * velocityA[i];
      b += r * velocityB[i];
    }
  } else {
    for (let i = 0; i < n; i++) {
      const r = rho[i] + extra[i];
      a += r * velocityA[i];
      b += r * velocityB[i];
    }
  }
  return a > 0 && b > 0;
}

/**
 * Merges two adjacent trajectory segments and applies the no-U-turn checks to the
 * result in one pass: `rhoFirst` becomes ρ₁ + ρ₂ (in place), and the return value says
 * whether all of these hold (each as in {@link trajectoryPersists}):
 * - the merged segment, with the velocities at `firstStart` and `secondEnd`;
 * - with `across`: the first segment plus the second's first point (ρ₁ + p(secondStart),
 *   velocities at firstStart and secondStart), and the first's last point plus the
 *   second segment (ρ₂ + p(firstEnd), velocities at firstEnd and secondEnd).
 *
 * "First" is the segment nearer the trajectory's starting point, in the direction of
 * growth. The checks across segments are redundant when both are single points.
 */
export function mergeSegments(
  rhoFirst: Float64Array,
  rhoSecond: Float64Array,
  vFirstStart: Float64Array,
  pFirstEnd: Float64Array,
  vFirstEnd: Float64Array,
  pSecondStart: Float64Array,
  vSecondStart: Float64Array,
  vSecondEnd: Float64Array,
  across: boolean,
): boolean {
  const n = rhoFirst.length;
  let a0 = 0;
  let b0 = 0;
  if (!across) {
    for (let i = 0; i < n; i++) {
      const r = rhoFirst[i] + rhoSecond[i];
      rhoFirst[i] = r;
      a0 += r * vFirstStart[i];
      b0 += r * vSecondEnd[i];
    }
    return a0 > 0 && b0 > 0;
  }
  let a1 = 0;
  let b1 = 0;
  let a2 = 0;
  let b2 = 0;
  for (let i = 0; i < n; i++) {
    const r1 = rhoFirst[i];
    const r2 = rhoSecond[i];
    const r = r1 + r2;
    rhoFirst[i] = r;
    const vfs = vFirstStart[i];
    const vse = vSecondEnd[i];
    a0 += r * vfs;
    b0 += r * vse;
    const e1 = r1 + pSecondStart[i];
    a1 += e1 * vfs;
    b1 += e1 * vSecondStart[i];
    const e2 = r2 + pFirstEnd[i];
    a2 += e2 * vFirstEnd[i];
    b2 += e2 * vse;
  }
  return a0 > 0 && b0 > 0 && a1 > 0 && b1 > 0 && a2 > 0 && b2 > 0;
}

/**
 * References to what one merge of two adjacent trajectory segments needs from the
 * first segment and from the second segment's first point; the second segment's
 * summed momentum and last velocity come from the caller. Filled by the tree builder
 * before each {@link mergeChain}; no data is copied.
 */
export interface MergeInputs {
  /** Summed momentum of the first segment. Receives the merged sum when it is the last level. */
  rhoFirst: Float64Array;
  /** Velocity at the first segment's first point. */
  vFirstStart: Float64Array;
  /** Momentum and velocity at the first segment's last point (levels ≥ 2 only). */
  pFirstEnd: Float64Array;
  vFirstEnd: Float64Array;
  /** Momentum and velocity at the second segment's first point (levels ≥ 2 only). */
  pSecondStart: Float64Array;
  vSecondStart: Float64Array;
}

/** An empty set of merge inputs (all references to one zero-length array). */
export function createMergeInputs(): MergeInputs {
  const none = new Float64Array(0);
  return { rhoFirst: none, vFirstStart: none, pFirstEnd: none, vFirstEnd: none, pSecondStart: none, vSecondStart: none };
}

/**
 * The merges that complete when a trajectory point with momentum `p` and velocity `v`
 * is added: level 1 merges the point with the single point before it; level k ≥ 2
 * merges two segments of 2^(k−1) points whose second one ends at this point and has
 * the summed momentum produced by level k − 1. Level 1 has only the check of the
 * whole merged segment (the checks across would repeat it); levels ≥ 2 have all three
 * checks of {@link mergeSegments}.
 *
 * The arithmetic is that of {@link mergeSegments} applied level by level, in the same
 * order of operations, so results are bit-identical; levels 1 and 2 share one pass
 * over the coordinates, with the intermediate sum kept in a register.
 *
 * For `count` ≤ 2 the merged sum of the last level is written to `out` (which may be
 * `levels[count − 1].rhoFirst`, but no other input); for `count` > 2 it is left in
 * `levels[count − 1].rhoFirst`, and `scratch` (length dim) is overwritten.
 * Returns how many levels, from level 1 up, pass their checks (stopping at the first
 * that fails): `count` when all do.
 */
export function mergeChain(
  levels: readonly MergeInputs[],
  count: number,
  p: Float64Array,
  v: Float64Array,
  out: Float64Array,
  scratch: Float64Array,
): number {
  if (count === 1) return mergePoint(levels[0], p, v, out);
  const held = mergePointAndPair(levels[0], levels[1], p, v, count === 2 ? out : scratch);
  if (count === 2 || held < 2) return held;
  let second = scratch;
  for (let k = 2; k < count; k++) {
    const l = levels[k];
    const ok = mergeSegments(l.rhoFirst, second, l.vFirstStart, l.pFirstEnd, l.vFirstEnd, l.pSecondStart, l.vSecondStart, v, true);
    if (!ok) return k;
    second = l.rhoFirst;
  }
  return count;
}

function mergePoint(l1: MergeInputs, p: Float64Array, v: Float64Array, out: Float64Array): number {
  const n = p.length;
  const rho = l1.rhoFirst;
  const vfs = l1.vFirstStart;
  let a = 0;
  let b = 0;
  for (let i = 0; i < n; i++) {
    const r = rho[i] + p[i];
    out[i] = r;
    a += r * vfs[i];
    b += r * v[i];
  }
  return a > 0 && b > 0 ? 1 : 0;
}

function mergePointAndPair(l1: MergeInputs, l2: MergeInputs, p: Float64Array, v: Float64Array, out: Float64Array): number {
  const n = p.length;
  const rho1 = l1.rhoFirst;
  const vfs1 = l1.vFirstStart;
  const rho2 = l2.rhoFirst;
  const vfs2 = l2.vFirstStart;
  const pfe2 = l2.pFirstEnd;
  const vfe2 = l2.vFirstEnd;
  const pss2 = l2.pSecondStart;
  const vss2 = l2.vSecondStart;
  let a1 = 0;
  let b1 = 0;
  let a20 = 0;
  let b20 = 0;
  let a21 = 0;
  let b21 = 0;
  let a22 = 0;
  let b22 = 0;
  for (let i = 0; i < n; i++) {
    const vi = v[i];
    const s1 = rho1[i] + p[i];
    a1 += s1 * vfs1[i];
    b1 += s1 * vi;
    const f2 = rho2[i];
    const s2 = f2 + s1;
    out[i] = s2;
    const w2 = vfs2[i];
    a20 += s2 * w2;
    b20 += s2 * vi;
    const e21 = f2 + pss2[i];
    a21 += e21 * w2;
    b21 += e21 * vss2[i];
    const e22 = s1 + pfe2[i];
    a22 += e22 * vfe2[i];
    b22 += e22 * vi;
  }
  if (!(a1 > 0 && b1 > 0)) return 0;
  return a20 > 0 && b20 > 0 && a21 > 0 && b21 > 0 && a22 > 0 && b22 > 0 ? 2 : 1;
}

/**
 * Offsets (into a slab, see leapfrog.ts) of what one merge needs; the slab form of
 * {@link MergeInputs}.
 */
export interface SlabMerge {
  rhoFirst: number;
  vFirstStart: number;
  pFirstEnd: number;
  vFirstEnd: number;
  pSecondStart: number;
  vSecondStart: number;
}

/** Merge offsets, all 0 until set. */
export function createSlabMerge(): SlabMerge {
  return { rhoFirst: 0, vFirstStart: 0, pFirstEnd: 0, vFirstEnd: 0, pSecondStart: 0, vSecondStart: 0 };
}

/** Twice the kinetic energy computed by a fused kick. */
export interface KickEnergy {
  twiceKinetic: number;
}

/**
 * The second half-kick of a leapfrog step for a diagonal metric on a slab (as
 * `slabKick` in leapfrog.ts, writing p, v at `pOut`, `vOut` and pᵀv into
 * `energy.twiceKinetic`) fused with the level-1 merge of the new point with the point
 * before it (as {@link mergeChain} with one level): the summed momentum goes to `out`.
 * Returns 1 when the merge passes its checks, else 0.
 */
export function slabKickMergePoint(
  s: Float64Array,
  n: number,
  half: number,
  g: number,
  m: number,
  stepSize: number,
  pOut: number,
  vOut: number,
  energy: KickEnergy,
  l1: SlabMerge,
  out: number,
): number {
  const h = 0.5 * stepSize;
  const rho1 = l1.rhoFirst;
  const vfs1 = l1.vFirstStart;
  let twiceKinetic = 0;
  let a1 = 0;
  let b1 = 0;
  for (let i = 0; i < n; i++) {
    const pi = s[half + i] + h * s[g + i];
    const vi = s[m + i] * pi;
    s[pOut + i] = pi;
    s[vOut + i] = vi;
    twiceKinetic += pi * vi;
    const s1 = s[rho1 + i] + pi;
    s[out + i] = s1;
    a1 += s1 * s[vfs1 + i];
    b1 += s1 * vi;
  }
  energy.twiceKinetic = twiceKinetic;
  return a1 > 0 && b1 > 0 ? 1 : 0;
}

/**
 * As {@link slabKickMergePoint}, fused with levels 1 and 2 (the level-2 merge has all
 * three checks of {@link mergeSegments}); the level-2 sum goes to `out`. Returns how
 * many of the two levels pass, from level 1 up.
 */
export function slabKickMergePair(
  s: Float64Array,
  n: number,
  half: number,
  g: number,
  m: number,
  stepSize: number,
  pOut: number,
  vOut: number,
  energy: KickEnergy,
  l1: SlabMerge,
  l2: SlabMerge,
  out: number,
): number {
  const h = 0.5 * stepSize;
  const rho1 = l1.rhoFirst;
  const vfs1 = l1.vFirstStart;
  const rho2 = l2.rhoFirst;
  const vfs2 = l2.vFirstStart;
  const pfe2 = l2.pFirstEnd;
  const vfe2 = l2.vFirstEnd;
  const pss2 = l2.pSecondStart;
  const vss2 = l2.vSecondStart;
  let twiceKinetic = 0;
  let a1 = 0;
  let b1 = 0;
  let a20 = 0;
  let b20 = 0;
  let a21 = 0;
  let b21 = 0;
  let a22 = 0;
  let b22 = 0;
  for (let i = 0; i < n; i++) {
    const pi = s[half + i] + h * s[g + i];
    const vi = s[m + i] * pi;
    s[pOut + i] = pi;
    s[vOut + i] = vi;
    twiceKinetic += pi * vi;
    const s1 = s[rho1 + i] + pi;
    a1 += s1 * s[vfs1 + i];
    b1 += s1 * vi;
    const f2 = s[rho2 + i];
    const s2 = f2 + s1;
    s[out + i] = s2;
    const w2 = s[vfs2 + i];
    a20 += s2 * w2;
    b20 += s2 * vi;
    const e21 = f2 + s[pss2 + i];
    a21 += e21 * w2;
    b21 += e21 * s[vss2 + i];
    const e22 = s1 + s[pfe2 + i];
    a22 += e22 * s[vfe2 + i];
    b22 += e22 * vi;
  }
  energy.twiceKinetic = twiceKinetic;
  if (!(a1 > 0 && b1 > 0)) return 0;
  return a20 > 0 && b20 > 0 && a21 > 0 && b21 > 0 && a22 > 0 && b22 > 0 ? 2 : 1;
}

/**
 * {@link slabKickMergePoint} fused also with the first half of the next leapfrog step
 * (half = p + ε/2 g, qNext = q + ε m half; `qNext` differs from `q`). Bit-identical to the
 * separate kernels.
 */
export function slabKickMergePointDrift(
  s: Float64Array,
  n: number,
  half: number,
  g: number,
  m: number,
  stepSize: number,
  pOut: number,
  vOut: number,
  energy: KickEnergy,
  l1: SlabMerge,
  out: number,
  q: number,
  qNext: number,
): number {
  const h = 0.5 * stepSize;
  const rho1 = l1.rhoFirst;
  const vfs1 = l1.vFirstStart;
  let twiceKinetic = 0;
  let a1 = 0;
  let b1 = 0;
  for (let i = 0; i < n; i++) {
    const gi = s[g + i];
    const mi = s[m + i];
    const pi = s[half + i] + h * gi;
    const vi = mi * pi;
    s[pOut + i] = pi;
    s[vOut + i] = vi;
    twiceKinetic += pi * vi;
    const next = pi + h * gi;
    s[half + i] = next;
    s[qNext + i] = s[q + i] + stepSize * mi * next;
    const s1 = s[rho1 + i] + pi;
    s[out + i] = s1;
    a1 += s1 * s[vfs1 + i];
    b1 += s1 * vi;
  }
  energy.twiceKinetic = twiceKinetic;
  return a1 > 0 && b1 > 0 ? 1 : 0;
}

/**
 * {@link slabKickMergePair} fused also with the first half of the next leapfrog step
 * (half = p + ε/2 g, qNext = q + ε m half; `qNext` differs from `q`). Bit-identical to the
 * separate kernels.
 */
export function slabKickMergePairDrift(
  s: Float64Array,
  n: number,
  half: number,
  g: number,
  m: number,
  stepSize: number,
  pOut: number,
  vOut: number,
  energy: KickEnergy,
  l1: SlabMerge,
  l2: SlabMerge,
  out: number,
  q: number,
  qNext: number,
): number {
  const h = 0.5 * stepSize;
  const rho1 = l1.rhoFirst;
  const vfs1 = l1.vFirstStart;
  const rho2 = l2.rhoFirst;
  const vfs2 = l2.vFirstStart;
  const pfe2 = l2.pFirstEnd;
  const vfe2 = l2.vFirstEnd;
  const pss2 = l2.pSecondStart;
  const vss2 = l2.vSecondStart;
  let twiceKinetic = 0;
  let a1 = 0;
  let b1 = 0;
  let a20 = 0;
  let b20 = 0;
  let a21 = 0;
  let b21 = 0;
  let a22 = 0;
  let b22 = 0;
  for (let i = 0; i < n; i++) {
    const gi = s[g + i];
    const mi = s[m + i];
    const pi = s[half + i] + h * gi;
    const vi = mi * pi;
    s[pOut + i] = pi;
    s[vOut + i] = vi;
    twiceKinetic += pi * vi;
    const next = pi + h * gi;
    s[half + i] = next;
    s[qNext + i] = s[q + i] + stepSize * mi * next;
    const s1 = s[rho1 + i] + pi;
    a1 += s1 * s[vfs1 + i];
    b1 += s1 * vi;
    const f2 = s[rho2 + i];
    const s2 = f2 + s1;
    s[out + i] = s2;
    const w2 = s[vfs2 + i];
    a20 += s2 * w2;
    b20 += s2 * vi;
    const e21 = f2 + s[pss2 + i];
    a21 += e21 * w2;
    b21 += e21 * s[vss2 + i];
    const e22 = s1 + s[pfe2 + i];
    a22 += e22 * s[vfe2 + i];
    b22 += e22 * vi;
  }
  energy.twiceKinetic = twiceKinetic;
  if (!(a1 > 0 && b1 > 0)) return 0;
  return a20 > 0 && b20 > 0 && a21 > 0 && b21 > 0 && a22 > 0 && b22 > 0 ? 2 : 1;
}

/**
 * {@link mergeSegments} with all checks, on a slab: the first segment's summed momentum
 * at `rhoFirst` becomes the merged sum; the second's is at `rhoSecond`, its last
 * velocity at `vSecondEnd`.
 */
export function slabMergeAcross(
  s: Float64Array,
  n: number,
  l: SlabMerge,
  rhoSecond: number,
  vSecondEnd: number,
): boolean {
  const rf = l.rhoFirst;
  const vfs = l.vFirstStart;
  const pfe = l.pFirstEnd;
  const vfe = l.vFirstEnd;
  const pss = l.pSecondStart;
  const vss = l.vSecondStart;
  let a0 = 0;
  let b0 = 0;
  let a1 = 0;
  let b1 = 0;
  let a2 = 0;
  let b2 = 0;
  for (let i = 0; i < n; i++) {
    const r1 = s[rf + i];
    const r2 = s[rhoSecond + i];
    const r = r1 + r2;
    s[rf + i] = r;
    const w = s[vfs + i];
    const vse = s[vSecondEnd + i];
    a0 += r * w;
    b0 += r * vse;
    const e1 = r1 + s[pss + i];
    a1 += e1 * w;
    b1 += e1 * s[vss + i];
    const e2 = r2 + s[pfe + i];
    a2 += e2 * s[vfe + i];
    b2 += e2 * vse;
  }
  return a0 > 0 && b0 > 0 && a1 > 0 && b1 > 0 && a2 > 0 && b2 > 0;
}

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

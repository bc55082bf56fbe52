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

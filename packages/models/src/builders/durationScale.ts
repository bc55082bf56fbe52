/**
 * The factor that ties a transit's duration to its geometry. For a planet with impact
 * parameter b, radius ratio k, eccentricity e and argument of periastron ω, the total
 * duration is T14 ≈ (P/π) · (a/R_*)⁻¹ · √((1 + k)² − b²) · √(1 − e²)/(1 + e sin ω)
 * (Winn 2010, eqs. 14 and 16, for a/R_* ≫ 1), so at a fixed duration
 *
 *   a/R_* ∝ s,   ρ_* ∝ (a/R_*)³ ∝ s³,   s = √(1 − (b/(1 + k))²) · √(1 − e²)/(1 + e sin ω).
 *
 * The builders sample a/R_* (or ρ_*) divided by s (or s³): the value that a central
 * transit on a circular orbit of the same duration would imply. That coordinate is
 * nearly fixed by the data, while b, e and ω move freely along the ridge of equal
 * duration, which otherwise is a narrow curved valley for the sampler. Here e and
 * e sin ω come from (h, k_e) = (√e cos ω, √e sin ω): e = h² + k_e², e sin ω = r k_e with
 * r = √e.
 */

/** Slots of s and its partial derivatives in the output of {@link durationScaleInto}. */
export const DS_VALUE = 0;
export const DS_B = 1;
export const DS_K = 2;
export const DS_H = 3;
export const DS_KE = 4;

/**
 * Writes s and ∂s/∂b, ∂s/∂k, ∂s/∂h, ∂s/∂k_e into out[0..4] for an impact parameter
 * b, radius ratio k and eccentricity vector (h, k_e). Returns false when |b| ≥ 1 + k or
 * e ≥ 1 (s would be 0 or undefined).
 */
export function durationScaleInto(b: number, k: number, h: number, ke: number, out: Float64Array): boolean {
  const onePlusK = 1 + k;
  const q = b / onePlusK;
  const c2 = 1 - q * q;
  const e = h * h + ke * ke;
  if (!(c2 > 0) || !(e < 1) || !(onePlusK > 0)) return false;
  const c = Math.sqrt(c2);
  const r = Math.sqrt(e);
  const root = Math.sqrt((1 - e) * (1 + e));
  const den = 1 + r * ke;
  const g = root / den;
  out[DS_VALUE] = c * g;
  // ∂c/∂b = −q/((1 + k) c), ∂c/∂k = q²/((1 + k) c).
  out[DS_B] = (-q / (onePlusK * c)) * g;
  out[DS_K] = ((q * q) / (onePlusK * c)) * g;
  // ∂g/∂x = [∂root/∂x · den − root · ∂den/∂x]/den², with ∂root/∂x = −e (∂e/∂x)/root,
  // ∂e/∂h = 2h, ∂e/∂k_e = 2k_e, ∂den/∂h = h k_e/r, ∂den/∂k_e = r + k_e²/r (both → 0 at r = 0).
  const dDenH = r > 0 ? (h * ke) / r : 0;
  const dDenK = r > 0 ? r + (ke * ke) / r : 0;
  const den2 = den * den;
  out[DS_H] = c * ((((-e * 2 * h) / root) * den - root * dDenH) / den2);
  out[DS_KE] = c * ((((-e * 2 * ke) / root) * den - root * dDenK) / den2);
  return true;
}

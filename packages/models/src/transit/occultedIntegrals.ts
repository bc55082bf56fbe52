/**
 * The three integrals over the part of the stellar disk hidden by the planet that the
 * quadratic limb-darkening law needs, with their exact partial derivatives in the
 * centre separation z and the radius ratio k (both in stellar radii).
 *
 * Write the law as I(μ) = c0 + c1 μ + c2 μ², μ = √(1 - r²), r the distance from the
 * stellar centre. Over the occulted region O (the lens where the two disks overlap):
 *   area  = ∫_O dA,
 *   lin   = ∫_O √(1 - r²) dA,
 *   r2    = ∫_O r² dA          (so ∫_O μ² dA = area - r2).
 *
 * area and r2 are elementary. lin is the Mandel & Agol (2002, ApJ 580, L171) integral
 * (their λ_1, λ_2 with the Θ(k - z) term). Its closed form was re-derived here by
 * Green's theorem: for a radial integrand f(r), ∫_O f dA = ∮_∂O H(r) dθ with
 * H(r) = ∫_0^r s f(s) ds and θ the polar angle about the stellar centre (the same route
 * as Pál 2012, MNRAS 420, 1630, and Agol, Luger & Foreman-Mackey 2020, AJ 159, 123).
 * The boundary integral along the planet's limb reduces to complete elliptic integrals
 * of parameter m = (1 - (z - k)²)/(4zk) (planet crossing the limb, m < 1) or 1/m
 * (planet inside the disk, m > 1); the terms in K, E and Π of Mandel & Agol agree with
 * that reduction term by term. They are then regrouped, for float64 accuracy, into
 * Bulirsch cel calls whose integrands stay finite:
 *   - The Π term with its step Θ(k - z) is rewritten with the addition formula
 *     Π(n) + Π(m/n) = K + (π/2)√(n/((1 - n)(n - m))) for a change of characteristic
 *     (DLMF §19.7(iii); used here for n < 0, where the tests confirm the end result
 *     numerically). Its π/2 part cancels the step exactly, so the result is smooth
 *     through z = k with no special case and no loss of precision there.
 *   - The logarithmic divergences of K and Π at the internal contact z = 1 - k
 *     (m = 1) cancel inside one integrand: what multiplies sin²φ in each cel vanishes
 *     with kc² = 1 - m, so z = 1 - k (and k = z = 1/2) needs no special case either.
 * The results (with kc² = 1 - m, d = z - k, s = z + k, a = 1 - d²):
 *   crossing the limb (|1 - k| < z < 1 + k):
 *     lin = π/3 - [cel(kc, 1, α, a(s² - 1)/3) + d s · cel(kc, s²/(4zk), 1, kc²)] / (3√(zk)),
 *     α = ((s² - 1)(6k² + 2kz - 3) - 4zk(7k² + z² - 4))/3,
 *   inside the disk (z ≤ 1 - k, k < 1; here kc² = (1 - s²)/a):
 *     lin = π/3 + (2√a/9)[(6k² - 2kz - 3)·cel(kc,1,1,0) + kc²(6k² + 2kz - 3)·cel(kc,1,0,1)]
 *           - (2 d s/(3√a))·cel(kc, 1/a, 1, 0),
 *   lin = 0 without overlap and 2π/3 when the planet covers the whole disk.
 *
 * The partial derivatives follow from moving the boundary (Reynolds transport): only
 * the planet's limb inside the star moves, so with φ the position angle on the planet's
 * limb, ∂/∂k ∫_O f dA = k ∫ f dφ and ∂/∂z ∫_O f dA = k ∫ f cos φ dφ over that arc.
 * For f = √(1 - r²) these are complete integrals of the first and second kind only:
 *   crossing: ∂lin/∂k = 2√(k/z) a·cel(kc,1,1,0), ∂lin/∂z = -(2/3)√(k/z) a·cel(kc,1,1,2kc²),
 *   inside:   ∂lin/∂k = 4k√a·E(1 - kc²),          ∂lin/∂z = -(4k√a/3)·cel(kc,1,1,-kc²).
 * All of this is checked against independent numerical integration in the tests.
 */
import { celBasisPairInPlace } from './ellipticIntegrals.js';

/** Offsets in the output of {@link occultedIntegralsInPlace}. */
export const OCC_AREA = 0;
export const OCC_LIN = 1;
export const OCC_R2 = 2;
export const OCC_AREA_DZ = 3;
export const OCC_AREA_DK = 4;
export const OCC_LIN_DZ = 5;
export const OCC_LIN_DK = 6;
export const OCC_R2_DZ = 7;
export const OCC_R2_DK = 8;
/** Slots written by {@link occultedIntegralsInPlace}. */
export const OCC_SIZE = 9;

const PI = Math.PI;
const THIRD_PI = PI / 3;
const basis = new Float64Array(4);

/**
 * Occulted area, ∫ √(1 - r²) dA and ∫ r² dA over the lens, in units of R_*² (see the
 * file comment), and when `withPartials` their derivatives in z and k, written at
 * `out[at + OCC_*]`, for z read from out[at] (which the results overwrite: the callers
 * run once per point and V8 does not inline this function, so z passed as an argument
 * would be boxed). Without partials the derivative slots are left untouched.
 * No input checks: z ≥ 0, k > 0, both finite.
 */
export function occultedIntegralsInPlace(k: number, withPartials: boolean, out: Float64Array, at: number): void {
  let z = out[at];
  if (z >= 1 + k) {
    // No overlap (first/last contact included: the lens has zero area there).
    for (let i = 0; i < (withPartials ? OCC_SIZE : 3); i++) out[at + i] = 0;
    return;
  }
  const k2 = k * k;
  if (k >= 1 && z <= k - 1) {
    // The planet covers the whole stellar disk.
    out[at + OCC_AREA] = PI;
    out[at + OCC_LIN] = (2 * PI) / 3;
    out[at + OCC_R2] = PI / 2;
    if (withPartials) for (let i = 3; i < OCC_SIZE; i++) out[at + i] = 0;
    return;
  }
  const inside = k < 1 && z <= 1 - k;
  // Crossing the limb with z < 1e-100 happens only for k = 1; z is raised to 1e-100
  // there (the flux and partials then differ from their limits by O(1e-100)) to keep
  // z² and the triangle area below in range.
  if (!inside && z < 1e-100) z = 1e-100;
  const d = z - k;
  const s = z + k;
  // 1 - d², 1 - s² and s² - 1 from factors grouped so that near the contacts
  // (z ≈ 1 + k, z ≈ |1 - k|, and z → 0 with k = 1) nothing cancels.
  const a = (1 + k - z) * (z + (1 - k));
  const ds = d * s;
  if (inside) {
    // The planet's disk lies inside the stellar disk (internal contact included).
    const z2 = z * z;
    let kc2 = ((1 - k - z) * (1 + s)) / a;
    if (kc2 < 0) kc2 = 0;
    const kc = Math.sqrt(kc2);
    basis[0] = kc;
    basis[1] = 1 / a;
    celBasisPairInPlace(basis, 0);
    const c2 = basis[0]; // cel(kc, 1, 1, 0)
    const s2 = basis[1]; // cel(kc, 1, 0, 1)
    const pi3 = basis[2]; // cel(kc, 1/a, 1, 0)
    const ra = Math.sqrt(a);
    const zk2 = 2 * z * k;
    const six = 6 * k2 - 3;
    out[at + OCC_AREA] = PI * k2;
    out[at + OCC_LIN] = THIRD_PI + ((2 * ra) / 9) * ((six - zk2) * c2 + kc2 * (six + zk2) * s2) - ((2 * ds) / (3 * ra)) * pi3;
    out[at + OCC_R2] = PI * k2 * (z2 + 0.5 * k2);
    if (withPartials) {
      out[at + OCC_AREA_DZ] = 0;
      out[at + OCC_AREA_DK] = 2 * PI * k;
      const f = 4 * k * ra;
      out[at + OCC_LIN_DZ] = (-f / 3) * (c2 - kc2 * s2);
      out[at + OCC_LIN_DK] = f * (c2 + kc2 * s2);
      out[at + OCC_R2_DZ] = 2 * PI * z * k2;
      out[at + OCC_R2_DK] = 2 * PI * k * (z2 + k2);
    }
    return;
  }
  // The planet's limb crosses the stellar limb: |1 - k| < z < 1 + k, so z > 0.
  const z2 = z * z;
  // Kite of the two centres and the two limb intersections; stable Heron formula
  // with the sides sorted (W. Kahan, lecture notes "Miscalculating area and angles of
  // a needle-like triangle"); its area is twice that of the triangle (1, k, z).
  let p = 1;
  let q = k;
  let r = z;
  if (q > p) {
    const t = p;
    p = q;
    q = t;
  }
  if (r > p) {
    const t = p;
    p = r;
    r = t;
  }
  if (r > q) {
    const t = q;
    q = r;
    r = t;
  }
  const heron = (p + (q + r)) * (r - (p - q)) * (r + (p - q)) * (p + (q - r));
  const kite = heron > 0 ? 0.5 * Math.sqrt(heron) : 0;
  // kappa0: half-angle of the occulted arc of the planet's limb, seen from the
  // planet's centre; kappa1: half-angle of the occulted arc of the star's limb.
  const kappa0 = Math.atan2(2 * kite, (k - 1) * (k + 1) + z2);
  const kappa1 = Math.atan2(2 * kite, (1 - k) * (1 + k) + z2);
  const zk = z * k;
  const s2m1 = (z + (k - 1)) * (s + 1);
  let kc2 = s2m1 / (4 * zk);
  if (kc2 < 0) kc2 = 0;
  const kc = Math.sqrt(kc2);
  basis[0] = kc;
  basis[1] = (s * s) / (4 * zk);
  celBasisPairInPlace(basis, 0);
  const c2 = basis[0];
  const s2 = basis[1];
  const alpha = (s2m1 * (6 * k2 + 2 * zk - 3) - 4 * zk * (7 * k2 + z2 - 4)) / 3;
  const beta = (a * s2m1) / 3;
  const pi2 = basis[2] + kc2 * basis[3]; // cel(kc, s²/(4zk), 1, kc²)
  const rzk = Math.sqrt(zk);
  out[at + OCC_AREA] = k2 * kappa0 + kappa1 - kite;
  out[at + OCC_LIN] = THIRD_PI - (alpha * c2 + beta * s2 + ds * pi2) / (3 * rzk);
  out[at + OCC_R2] = 0.5 * (kappa1 + kappa0 * k2 * (k2 + 2 * z2) - 0.5 * kite * (1 + 5 * k2 + z2));
  if (withPartials) {
    // k sin(kappa0) = kite / z.
    const kSin0 = kite / z;
    out[at + OCC_AREA_DZ] = -2 * kSin0;
    out[at + OCC_AREA_DK] = 2 * k * kappa0;
    const g = Math.sqrt(k / z) * a;
    out[at + OCC_LIN_DZ] = (-2 / 3) * g * (c2 + 2 * kc2 * s2);
    out[at + OCC_LIN_DK] = 2 * g * c2;
    out[at + OCC_R2_DZ] = 2 * z * k2 * kappa0 - kSin0 * (1 + z2 + k2);
    out[at + OCC_R2_DK] = 2 * k * ((z2 + k2) * kappa0 - 2 * z * kSin0);
  }
}

/**
 * Complete elliptic integrals in float64 through Bulirsch's general complete integral
 *
 *   cel(kc, p, a, b) = ∫_0^{π/2} (a cos²φ + b sin²φ) / ((cos²φ + p sin²φ) √(cos²φ + kc² sin²φ)) dφ
 *
 * computed by his Gauss–Landen (arithmetic–geometric mean) iteration (Bulirsch 1969,
 * Numer. Math. 13, 305, "Numerical calculation of elliptic integrals and elliptic
 * functions. III"). One routine covers the three kinds with parameter m = 1 - kc²:
 *   K(m) = cel(kc, 1, 1, 1),  E(m) = cel(kc, 1, 1, kc²),  Π(n, m) = cel(kc, 1 - n, 1, 1),
 * and, more usefully, any linear combination of them as a single integral whose
 * integrand stays positive or bounded where the separate terms diverge or cancel.
 * The iteration converges quadratically; each call costs a handful of square roots.
 */
import { TransitParameterError } from './errors.js';

/**
 * Stop when the arithmetic and geometric means agree to this relative size; the
 * quadratic convergence then leaves an error at the rounding level in the final step.
 */
const MEANS_AGREE = 1e-9;
/**
 * kc = 0 is the logarithmic singularity of K. Integrals with b = 0 stay finite there;
 * the iteration needs kc > 0, and with this floor it converges in about a dozen steps
 * while the divergent part, of size b·ln(4/kc), is absent when b = 0.
 */
const KC_FLOOR = 1e-200;
const HALF_PI = Math.PI / 2;


/**
 * Bulirsch's cel(kc, p, a, b) for p > 0 (see the file comment). No input checks;
 * `kc` may be of either sign (only |kc| enters), and kc = 0 is replaced by a tiny
 * positive floor, which is exact for integrals that are finite at kc = 0 (b = 0).
 */
export function celUnchecked(kc: number, p: number, a: number, b: number): number {
  let qc = Math.abs(kc);
  if (qc < KC_FLOOR) qc = KC_FLOOR;
  let e = qc;
  let m = 1;
  let pp = Math.sqrt(p);
  let aa = a;
  let bb = b / pp;
  for (;;) {
    const f = aa;
    aa += bb / pp;
    const g = e / pp;
    bb += f * g;
    bb += bb;
    pp += g;
    const mOld = m;
    m += qc;
    if (Math.abs(mOld - qc) <= mOld * MEANS_AGREE) break;
    qc = 2 * Math.sqrt(e);
    e = qc * m;
  }
  return (HALF_PI * (aa * m + bb)) / (m * (m + pp));
}

/**
 * The cel basis integrals for two characteristics sharing one modulus, in one
 * iteration (the arithmetic–geometric-mean sequence depends on kc only): reads kc and p
 * from out[at], out[at + 1] and writes
 * out[at..at+3] = [cel(kc, 1, 1, 0), cel(kc, 1, 0, 1), cel(kc, p, 1, 0), cel(kc, p, 0, 1)].
 * The inputs come through the array because the callers run once per point and V8 does
 * not inline this function: doubles passed as arguments would be boxed, one heap
 * allocation each per call. No input checks (p > 0).
 */
export function celBasisPairInPlace(out: Float64Array, at: number): void {
  const kc = out[at];
  const p = out[at + 1];
  let qc = Math.abs(kc);
  if (qc < KC_FLOOR) qc = KC_FLOOR;
  let e = qc;
  let m = 1;
  // Characteristic 1: p1 = 1 (√1 = 1).
  let p1 = 1;
  let a1 = 1;
  let b1 = 0;
  let a2 = 0;
  let b2 = 1;
  // Characteristic p.
  let pp = Math.sqrt(p);
  let a3 = 1;
  let b3 = 0;
  let a4 = 0;
  let b4 = 1 / pp;
  for (;;) {
    // One reciprocal per characteristic and step instead of three divisions.
    const r1 = 1 / p1;
    const g1 = e * r1;
    const f1 = a1;
    const f2 = a2;
    a1 += b1 * r1;
    a2 += b2 * r1;
    b1 = 2 * (b1 + f1 * g1);
    b2 = 2 * (b2 + f2 * g1);
    p1 += g1;
    const r2 = 1 / pp;
    const g2 = e * r2;
    const f3 = a3;
    const f4 = a4;
    a3 += b3 * r2;
    a4 += b4 * r2;
    b3 = 2 * (b3 + f3 * g2);
    b4 = 2 * (b4 + f4 * g2);
    pp += g2;
    const mOld = m;
    m += qc;
    if (Math.abs(mOld - qc) <= mOld * MEANS_AGREE) break;
    qc = 2 * Math.sqrt(e);
    e = qc * m;
  }
  const s1 = HALF_PI / (m * (m + p1));
  const s2 = HALF_PI / (m * (m + pp));
  out[at] = (a1 * m + b1) * s1;
  out[at + 1] = (a2 * m + b2) * s1;
  out[at + 2] = (a3 * m + b3) * s2;
  out[at + 3] = (a4 * m + b4) * s2;
}

function checkParameter(m: number, field: string): void {
  if (!(m >= 0 && m < 1)) {
    throw new TransitParameterError(field, m, 'a parameter m = k² in [0, 1)');
  }
}

/**
 * Bulirsch's general complete elliptic integral cel(kc, p, a, b) (definition in the
 * file comment), float64.
 *
 * @param kc complementary modulus, finite and non-zero (only |kc| matters).
 * @param p positive, finite.
 * @param a coefficient of cos² in the numerator, finite.
 * @param b coefficient of sin² in the numerator, finite.
 */
export function generalCompleteEllipticIntegral(kc: number, p: number, a: number, b: number): number {
  if (!(Number.isFinite(kc) && kc !== 0)) {
    throw new TransitParameterError('kc', kc, 'a finite non-zero complementary modulus');
  }
  if (!(p > 0 && p < Infinity)) throw new TransitParameterError('p', p, 'a positive finite number');
  if (!Number.isFinite(a)) throw new TransitParameterError('a', a, 'a finite number');
  if (!Number.isFinite(b)) throw new TransitParameterError('b', b, 'a finite number');
  return celUnchecked(kc, p, a, b);
}

/**
 * Complete elliptic integral of the first kind K(m) = ∫_0^{π/2} dφ / √(1 - m sin²φ),
 * parameter m = k² in [0, 1).
 */
export function completeEllipticK(m: number): number {
  checkParameter(m, 'm');
  return celUnchecked(Math.sqrt(1 - m), 1, 1, 1);
}

/**
 * Complete elliptic integral of the second kind E(m) = ∫_0^{π/2} √(1 - m sin²φ) dφ,
 * parameter m = k² in [0, 1].
 */
export function completeEllipticE(m: number): number {
  if (m === 1) return 1;
  checkParameter(m, 'm');
  const kc2 = 1 - m;
  return celUnchecked(Math.sqrt(kc2), 1, 1, kc2);
}

/**
 * Complete elliptic integral of the third kind
 * Π(n, m) = ∫_0^{π/2} dφ / ((1 - n sin²φ) √(1 - m sin²φ)), characteristic n < 1,
 * parameter m in [0, 1).
 */
export function completeEllipticPi(n: number, m: number): number {
  if (!(n < 1 && n > -Infinity)) throw new TransitParameterError('n', n, 'a characteristic n < 1');
  checkParameter(m, 'm');
  return celUnchecked(Math.sqrt(1 - m), 1 - n, 1, 1);
}

/**
 * Log-gamma, the regularised incomplete beta function and its inverse: what the quantile
 * MCSE of Vehtari et al. (2021) needs (quantiles of a Beta(S_eff p + 1, S_eff (1 - p) + 1)).
 *
 * - logGamma: Lanczos (1964, SIAM J. Numer. Anal. B 1, 86) approximation with g = 7 and nine
 *   coefficients (coefficients from memory; checked in the tests against exact factorials
 *   and Gamma(1/2) = sqrt(pi)), relative error near 1e-15 for x ≥ 0.5; reflection below.
 * - regularizedBeta: the continued fraction for I_x(a, b) (Abramowitz & Stegun 1964, 26.5.8),
 *   evaluated by the modified Lentz method (Lentz 1976, Applied Optics 15, 668), using the
 *   symmetry I_x(a, b) = 1 - I_{1-x}(b, a) where the fraction converges faster.
 * - betaQuantile: Newton's method on I_x(a, b) = p inside a bisection bracket.
 */

const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059, 12.507343278686905, -0.13857109526572012,
  9.9843695780195716e-6, 1.5056327351493116e-7,
];
const HALF_LOG_TWO_PI = 0.5 * Math.log(2 * Math.PI);

/** log Gamma(x) for x > 0 (and via reflection for non-integer x < 0.5). */
export function logGamma(x: number): number {
  if (x < 0.5) return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - logGamma(1 - x);
  const z = x - 1;
  let sum = LANCZOS[0];
  for (let i = 1; i < LANCZOS.length; i++) sum += LANCZOS[i] / (z + i);
  const t = z + LANCZOS_G + 0.5;
  return HALF_LOG_TWO_PI + (z + 0.5) * Math.log(t) - t + Math.log(sum);
}

/** log B(a, b) = log Gamma(a) + log Gamma(b) - log Gamma(a + b). */
export function logBeta(a: number, b: number): number {
  return logGamma(a) + logGamma(b) - logGamma(a + b);
}

function continuedFraction(x: number, a: number, b: number): number {
  const tiny = 1e-300;
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < tiny) d = tiny;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= 100000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < tiny) d = tiny;
    c = 1 + aa / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < 1e-15) return h;
  }
  return h;
}

/** Regularised incomplete beta function I_x(a, b), a, b > 0, 0 ≤ x ≤ 1. */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (!(a > 0 && b > 0) || !(x >= 0 && x <= 1)) return NaN;
  if (x === 0) return 0;
  if (x === 1) return 1;
  const front = Math.exp(a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b));
  if (x < (a + 1) / (a + b + 2)) return (front * continuedFraction(x, a, b)) / a;
  return 1 - (front * continuedFraction(1 - x, b, a)) / b;
}

/** Beta(a, b) density at x. */
function betaDensity(x: number, a: number, b: number, lbeta: number): number {
  return Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - lbeta);
}

/**
 * Quantile of the Beta(a, b) distribution: the x in [0, 1] with I_x(a, b) = p.
 * Starts from the normal approximation, then Newton steps kept inside a bisection bracket.
 */
export function betaQuantile(p: number, a: number, b: number): number {
  if (!(a > 0 && b > 0) || !(p >= 0 && p <= 1)) return NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  const lbeta = logBeta(a, b);
  let lo = 0;
  let hi = 1;
  const mean = a / (a + b);
  const sd = Math.sqrt((a * b) / ((a + b) * (a + b) * (a + b + 1)));
  // Crude start; the bracket makes any start safe.
  const z = p < 0.5 ? -Math.sqrt(-2 * Math.log(p)) * 0.7 : Math.sqrt(-2 * Math.log(1 - p)) * 0.7;
  let x = Math.min(1 - 1e-12, Math.max(1e-12, mean + z * sd));
  for (let iter = 0; iter < 200; iter++) {
    const f = regularizedBeta(x, a, b) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const density = betaDensity(x, a, b, lbeta);
    let next = density > 0 && Number.isFinite(density) ? x - f / density : NaN;
    if (!(next > lo && next < hi)) next = 0.5 * (lo + hi);
    if (Math.abs(next - x) <= 1e-15 * Math.max(x, 1e-300) || hi - lo <= 1e-16) return next;
    x = next;
  }
  return x;
}

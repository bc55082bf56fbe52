/**
 * Error function family and the standard normal distribution function, float64.
 *
 * erf(x) for |x| < 1.5 by the everywhere-positive series
 *   erf(x) = (2/√π) e^{−x²} Σ_{n≥0} 2ⁿ x^{2n+1} / (1·3·…·(2n+1))
 * (Abramowitz & Stegun 1964, eq. 7.1.6), and erfc(x) for x ≥ 1.5 through the upper
 * incomplete gamma function, erfc(x) = Γ(½, x²)/√π (A&S eq. 6.5.17 with 7.1.2), whose
 * continued fraction converges quickly for x² > 1.5 (evaluated by the modified Lentz
 * method). Both are accurate to a few units in the last place.
 */

const SQRT_PI = Math.sqrt(Math.PI);
const SQRT2 = Math.SQRT2;
const LOG_SQRT_2PI = 0.5 * Math.log(2 * Math.PI);

/** erf(x) by the positive series; intended for |x| < 1.5. */
function erfSeries(x: number): number {
  const x2 = x * x;
  let term = x;
  let sum = x;
  for (let n = 1; n < 200; n++) {
    term *= (2 * x2) / (2 * n + 1);
    sum += term;
    if (Math.abs(term) < 1e-17 * Math.abs(sum)) break;
  }
  return ((2 / SQRT_PI) * Math.exp(-x2)) * sum;
}

/** e^{x²} erfc(x) for x ≥ 1.5, by the continued fraction of Γ(½, x²). */
function erfcScaledLarge(x: number): number {
  const a = 0.5;
  const t = x * x;
  const tiny = 1e-300;
  let b = t + 1 - a;
  let c = 1 / tiny;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 500; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < tiny) d = tiny;
    c = b + an / c;
    if (Math.abs(c) < tiny) c = tiny;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < 1e-16) break;
  }
  // Γ(½, t) = e^{−t} t^{½} h, so e^{x²} erfc(x) = x h / √π.
  return (x * h) / SQRT_PI;
}

/** The error function. */
export function erf(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (Math.abs(x) < 1.5) return erfSeries(x);
  return x > 0 ? 1 - erfc(x) : erfc(-x) - 1;
}

/** The complementary error function 1 − erf(x), accurate in the upper tail. */
export function erfc(x: number): number {
  if (Number.isNaN(x)) return NaN;
  if (x >= 1.5) return x > 27 ? 0 : Math.exp(-x * x) * erfcScaledLarge(x); // erfc(27) < 1e-318
  if (x > -1.5) return 1 - erfSeries(x);
  return 2 - erfc(-x);
}

/** ln erfc(x), finite far into the upper tail (no underflow). */
export function logErfc(x: number): number {
  if (x === Infinity) return -Infinity;
  if (x >= 1.5) return -x * x + Math.log(erfcScaledLarge(x));
  return Math.log(erfc(x));
}

/** Standard normal distribution function Φ(z). */
export function normalCdf(z: number): number {
  return 0.5 * erfc(-z / SQRT2);
}

/** ln Φ(z), accurate in both tails. */
export function logNormalCdf(z: number): number {
  if (z > 0) return Math.log1p(-0.5 * erfc(z / SQRT2));
  return logErfc(-z / SQRT2) - Math.LN2;
}

/** ln φ(z) of the standard normal density. */
export function logNormalPdf(z: number): number {
  return -0.5 * z * z - LOG_SQRT_2PI;
}

/**
 * ln(Φ(b) − Φ(a)) for a < b, without cancellation in either tail.
 */
export function logNormalInterval(a: number, b: number): number {
  if (!(a < b)) return -Infinity;
  if (a >= 0) {
    // Both in the upper tail: use the symmetric lower-tail form.
    const la = logNormalCdf(-a);
    const lb = logNormalCdf(-b);
    return la + Math.log1p(-Math.exp(lb - la));
  }
  if (b <= 0) {
    const la = logNormalCdf(a);
    const lb = logNormalCdf(b);
    return lb + Math.log1p(-Math.exp(la - lb));
  }
  // a < 0 < b: both tails are at most one half, no cancellation.
  return Math.log1p(-normalCdf(a) - normalCdf(-b));
}

export { LOG_SQRT_2PI };

/**
 * Independent numerical references for the tests: composite Simpson integration, the
 * normal density, normal tail probabilities by integration, and a naive O(n^2) DFT.
 */

/** Composite Simpson rule on [a, b] with `intervals` (even) subintervals. */
export function simpson(f: (x: number) => number, a: number, b: number, intervals: number): number {
  const n = intervals % 2 === 0 ? intervals : intervals + 1;
  const h = (b - a) / n;
  let s = f(a) + f(b);
  for (let i = 1; i < n; i++) s += (i % 2 === 1 ? 4 : 2) * f(a + i * h);
  return (s * h) / 3;
}

export function normalDensity(x: number): number {
  return Math.exp(-0.5 * x * x) / Math.sqrt(2 * Math.PI);
}

/** Upper tail probability P(Z > z) for z ≥ 0, by Simpson integration of the density over [z, z + 14]. */
export function normalUpperTail(z: number): number {
  return simpson(normalDensity, z, z + 14, 40000);
}

/** Phi(z) by integration: 1/2 ± integral from 0 (central) or the upper tail (|z| > 1). */
export function normalCdf(z: number): number {
  if (Math.abs(z) <= 1) return 0.5 + Math.sign(z) * simpson(normalDensity, 0, Math.abs(z), 20000);
  return z > 0 ? 1 - normalUpperTail(z) : normalUpperTail(-z);
}

/** Naive discrete Fourier transform X_k = sum_t x_t exp(-2 pi i k t / n). */
export function naiveDft(re: ArrayLike<number>, im: ArrayLike<number>): { re: Float64Array; im: Float64Array } {
  const n = re.length;
  const outRe = new Float64Array(n);
  const outIm = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let sr = 0;
    let si = 0;
    for (let t = 0; t < n; t++) {
      const angle = (-2 * Math.PI * ((k * t) % n)) / n;
      const c = Math.cos(angle);
      const s = Math.sin(angle);
      sr += re[t] * c - im[t] * s;
      si += re[t] * s + im[t] * c;
    }
    outRe[k] = sr;
    outIm[k] = si;
  }
  return { re: outRe, im: outIm };
}

/** Mean and sample standard deviation. */
export function meanAndSd(values: readonly number[]): { mean: number; sd: number } {
  const mean = values.reduce((s, v) => s + v, 0) / values.length;
  const sd = Math.sqrt(values.reduce((s, v) => s + (v - mean) ** 2, 0) / (values.length - 1));
  return { mean, sd };
}

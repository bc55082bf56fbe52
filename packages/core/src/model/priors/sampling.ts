import type { RandomSource } from './prior.js';

/**
 * Gamma(shape, 1) deviate by Marsaglia & Tsang (2000, ACM TOMS 26, 363): for
 * shape ≥ 1 a squeeze-free rejection from a transformed normal; for shape < 1,
 * Gamma(shape + 1) · U^{1/shape} (their section 6).
 */
export function sampleStandardGamma(shape: number, source: RandomSource): number {
  if (shape < 1) {
    const g = sampleStandardGamma(shape + 1, source);
    return g * Math.pow(source.uniform(), 1 / shape);
  }
  const d = shape - 1 / 3;
  const c = 1 / Math.sqrt(9 * d);
  for (;;) {
    const x = source.normal();
    const t = 1 + c * x;
    if (t <= 0) continue;
    const v = t * t * t;
    const u = source.uniform();
    if (Math.log(u) < 0.5 * x * x + d - d * v + d * Math.log(v)) return d * v;
  }
}

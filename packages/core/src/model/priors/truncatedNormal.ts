import { LOG_SQRT_2PI, logNormalCdf, logNormalInterval } from '../math/normalCdf.js';
import { boundArgument, finiteArgument, orderedBounds, positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Normal(mean, sd) truncated to [lower, upper] (either bound may be infinite):
 * ln p = −½ z² − ln sd − ½ ln 2π − ln(Φ(β) − Φ(α)), z = (x − mean)/sd,
 * α = (lower − mean)/sd, β = (upper − mean)/sd. The normaliser is formed in log
 * space without cancellation in either tail.
 *
 * Sampled by inverting the distribution function: ln Φ(x) = ln(Φ(α) + U (Φ(β) − Φ(α)))
 * is solved by Newton's method safeguarded by bisection on [α, β], after reflecting an
 * interval that lies in the upper tail to the lower tail, where Φ keeps full precision.
 */
export function truncatedNormal(mean: number, sd: number, lower: number, upper: number): ScalarPrior {
  const m = finiteArgument('truncatedNormal.mean', mean);
  const s = positiveArgument('truncatedNormal.sd', sd);
  const lo = boundArgument('truncatedNormal.lower', lower);
  const hi = boundArgument('truncatedNormal.upper', upper);
  orderedBounds('truncatedNormal', lo, hi);
  const alpha = (lo - m) / s;
  const beta = (hi - m) / s;
  const logZ = logNormalInterval(alpha, beta);
  const c = -Math.log(s) - LOG_SQRT_2PI - logZ;
  const inv2 = 1 / (s * s);
  return {
    kind: 'truncatedNormal',
    description: `truncatedNormal(${m}, ${s}, ${lo}, ${hi})`,
    lower: lo,
    upper: hi,
    proper: true,
    circular: false,
    logDensity: (x) => (x >= lo && x <= hi ? c - 0.5 * (x - m) * (x - m) * inv2 : -Infinity),
    logDensityDerivative: (x) => (x >= lo && x <= hi ? -(x - m) * inv2 : 0),
    sample: (source) => m + s * sampleStandardTruncated(alpha, beta, source.uniform()),
  };
}

/** Standard normal truncated to [a, b], at probability level u ∈ (0, 1). */
export function sampleStandardTruncated(a: number, b: number, u: number): number {
  if (a > 0) return -sampleStandardTruncated(-b, -a, 1 - u);
  // Now a ≤ 0: Φ(a) is a lower-tail value with full relative precision.
  const lo = Math.max(a, -60);
  const hi = Math.min(b, 60);
  const logA = logNormalCdf(lo);
  const logB = logNormalCdf(hi);
  // ln p = ln(Φ(a) + u (Φ(b) − Φ(a))) = ln Φ(b) + ln(u + (1 − u) Φ(a)/Φ(b)).
  const target = logB + Math.log(u + (1 - u) * Math.exp(logA - logB));
  let left = lo;
  let right = hi;
  let x = Math.min(Math.max(0, left), right);
  if (!Number.isFinite(x)) x = 0.5 * (left + right);
  for (let iter = 0; iter < 200; iter++) {
    const lx = logNormalCdf(x);
    const h = lx - target;
    if (h > 0) right = x;
    else left = x;
    // h'(x) = φ(x)/Φ(x)
    const slope = Math.exp(-0.5 * x * x - 0.5 * Math.log(2 * Math.PI) - lx);
    let next = x - h / slope;
    if (!(next > left && next < right)) next = 0.5 * (left + right);
    if (Math.abs(next - x) <= 1e-15 * Math.max(1, Math.abs(x)) || right - left <= 1e-15 * Math.max(1, Math.abs(x))) {
      return next;
    }
    x = next;
  }
  return x;
}

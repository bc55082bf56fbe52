import { logBeta } from '../math/logGamma.js';
import { positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';
import { sampleStandardGamma } from './sampling.js';

/**
 * Beta(alpha, beta) on [0, 1]: ln p = (α − 1) ln x + (β − 1) ln(1 − x) − ln B(α, β).
 * Sampled as X/(X + Y) with X ~ Gamma(α), Y ~ Gamma(β). For α < 1 (β < 1) the end
 * x = 0 (x = 1) itself gets −∞: see the note in the code.
 */
export function beta(alpha: number, beta: number): ScalarPrior {
  const a = positiveArgument('beta.alpha', alpha);
  const b = positiveArgument('beta.beta', beta);
  const c = -logBeta(a, b);
  return {
    kind: 'beta',
    description: `beta(${a}, ${b})`,
    lower: 0,
    upper: 1,
    proper: true,
    circular: false,
    logDensity: (x) => {
      if (!(x >= 0 && x <= 1)) return -Infinity;
      // Where the density is infinite at an end, the end itself is treated as outside:
      // a value there can only come from rounding (e.g. the logistic map saturating at
      // |u| > 37), and +∞ would trap a sampler on it.
      if ((x === 0 && a < 1) || (x === 1 && b < 1)) return -Infinity;
      const left = a === 1 ? 0 : (a - 1) * Math.log(x);
      const right = b === 1 ? 0 : (b - 1) * Math.log1p(-x);
      return c + left + right;
    },
    logDensityDerivative: (x) => (x > 0 && x < 1 ? (a - 1) / x - (b - 1) / (1 - x) : 0),
    sample: (source) => {
      const x = sampleStandardGamma(a, source);
      const y = sampleStandardGamma(b, source);
      return x / (x + y);
    },
  };
}

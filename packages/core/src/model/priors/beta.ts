import { logBeta } from '../math/logGamma.js';
import { positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';
import { sampleStandardGamma } from './sampling.js';

/**
 * Beta(alpha, beta) on [0, 1]: ln p = (α − 1) ln x + (β − 1) ln(1 − x) − ln B(α, β).
 * Sampled as X/(X + Y) with X ~ Gamma(α), Y ~ Gamma(β).
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

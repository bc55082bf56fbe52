import { positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Exponential(rate) on x ≥ 0: ln p = ln rate − rate · x. Mean 1/rate.
 * @param rate rate > 0, in inverse parameter units
 */
export function exponential(rate: number): ScalarPrior {
  const r = positiveArgument('exponential.rate', rate);
  const c = Math.log(r);
  return {
    kind: 'exponential',
    description: `exponential(${r})`,
    lower: 0,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => (x >= 0 ? c - r * x : -Infinity),
    logDensityDerivative: (x) => (x >= 0 ? -r : 0),
    sample: (source) => -Math.log(source.uniform()) / r,
  };
}

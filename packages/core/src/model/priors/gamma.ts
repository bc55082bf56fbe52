import { logGamma } from '../math/logGamma.js';
import { positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';
import { sampleStandardGamma } from './sampling.js';

/**
 * Gamma(shape, rate) on x > 0: ln p = shape ln rate − ln Γ(shape) + (shape − 1) ln x − rate x.
 * Mean shape/rate.
 * @param shape shape α > 0
 * @param rate rate β > 0, in inverse parameter units
 */
export function gamma(shape: number, rate: number): ScalarPrior {
  const a = positiveArgument('gamma.shape', shape);
  const b = positiveArgument('gamma.rate', rate);
  const c = a * Math.log(b) - logGamma(a);
  return {
    kind: 'gamma',
    description: `gamma(${a}, ${b})`,
    lower: 0,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => (x > 0 ? c + (a - 1) * Math.log(x) - b * x : x === 0 && a === 1 ? c : -Infinity),
    logDensityDerivative: (x) => (x > 0 ? (a - 1) / x - b : 0),
    sample: (source) => sampleStandardGamma(a, source) / b,
  };
}

/**
 * Inverse-gamma(shape, scale) on x > 0 (1/x ~ Gamma(shape, rate = scale)):
 * ln p = shape ln scale − ln Γ(shape) − (shape + 1) ln x − scale/x.
 * @param shape shape α > 0
 * @param scale scale β > 0, in parameter units
 */
export function inverseGamma(shape: number, scale: number): ScalarPrior {
  const a = positiveArgument('inverseGamma.shape', shape);
  const b = positiveArgument('inverseGamma.scale', scale);
  const c = a * Math.log(b) - logGamma(a);
  return {
    kind: 'inverseGamma',
    description: `inverseGamma(${a}, ${b})`,
    lower: 0,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => (x > 0 ? c - (a + 1) * Math.log(x) - b / x : -Infinity),
    logDensityDerivative: (x) => (x > 0 ? (-(a + 1) + b / x) / x : 0),
    sample: (source) => b / sampleStandardGamma(a, source),
  };
}

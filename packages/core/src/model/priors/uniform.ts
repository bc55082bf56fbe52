import { PriorArgumentError } from '../errors.js';
import { finiteArgument, orderedBounds } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Uniform(lower, upper): ln p = −ln(upper − lower) on [lower, upper].
 * `uniform(-Math.PI, Math.PI)` is the circular uniform prior for angles.
 */
export function uniform(lower: number, upper: number): ScalarPrior {
  const a = finiteArgument('uniform.lower', lower);
  const b = finiteArgument('uniform.upper', upper);
  orderedBounds('uniform', a, b);
  const c = -Math.log(b - a);
  return {
    kind: 'uniform',
    description: `uniform(${a}, ${b})`,
    lower: a,
    upper: b,
    proper: true,
    circular: a === -Math.PI && b === Math.PI,
    logDensity: (x) => (x >= a && x <= b ? c : -Infinity),
    logDensityDerivative: () => 0,
    sample: (source) => a + (b - a) * source.uniform(),
  };
}

/**
 * Log-uniform(lower, upper) on [lower, upper], 0 < lower < upper (uniform in ln x):
 * ln p = −ln x − ln ln(upper/lower).
 */
export function logUniform(lower: number, upper: number): ScalarPrior {
  const a = finiteArgument('logUniform.lower', lower);
  const b = finiteArgument('logUniform.upper', upper);
  if (!(a > 0)) {
    throw new PriorArgumentError('logUniform.lower', lower, 'a finite number > 0');
  }
  orderedBounds('logUniform', a, b);
  const logA = Math.log(a);
  const span = Math.log(b) - logA;
  const c = -Math.log(span);
  return {
    kind: 'logUniform',
    description: `logUniform(${a}, ${b})`,
    lower: a,
    upper: b,
    proper: true,
    circular: false,
    logDensity: (x) => (x >= a && x <= b ? c - Math.log(x) : -Infinity),
    logDensityDerivative: (x) => (x >= a && x <= b ? -1 / x : 0),
    sample: (source) => Math.exp(logA + span * source.uniform()),
  };
}


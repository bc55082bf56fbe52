import { SupportArgumentError } from '../errors.js';
import { logLogistic, logistic } from '../math/logistic.js';
import { elementwiseSupport } from './elementwise.js';
import type { Support } from './transform.js';

function finite(field: string, x: unknown): number {
  if (typeof x !== 'number' || !Number.isFinite(x)) {
    throw new SupportArgumentError(field, x, 'a finite number');
  }
  return x;
}

/**
 * Values greater than `lower`: θ = lower + eᵘ, log|dθ/du| = u.
 * @param lower lower bound, in the parameter's own units
 */
export function lowerBounded(lower: number): Support {
  const a = finite('lowerBounded.lower', lower);
  return elementwiseSupport('lowerBounded', `lowerBounded(${a})`, a, Infinity, {
    forward: (u) => a + Math.exp(u),
    inverse: (t) => Math.log(t - a),
    logJacobian: (u) => u,
    derivative: (u) => Math.exp(u),
    logJacobianDerivative: () => 1,
    contains: (t) => t > a && t < Infinity,
  });
}

/** Values greater than zero: θ = eᵘ. */
export function positive(): Support {
  const s = lowerBounded(0);
  return { ...s, kind: 'positive', description: 'positive()' };
}

/**
 * Values less than `upper`: θ = upper − eᵘ, log|dθ/du| = u.
 * @param upper upper bound, in the parameter's own units
 */
export function upperBounded(upper: number): Support {
  const b = finite('upperBounded.upper', upper);
  return elementwiseSupport('upperBounded', `upperBounded(${b})`, -Infinity, b, {
    forward: (u) => b - Math.exp(u),
    inverse: (t) => Math.log(b - t),
    logJacobian: (u) => u,
    derivative: (u) => -Math.exp(u),
    logJacobianDerivative: () => 1,
    contains: (t) => t < b && t > -Infinity,
  });
}

/**
 * The open interval (lower, upper): θ = lower + (upper − lower) σ(u), with σ the
 * logistic function; log|dθ/du| = log(upper − lower) + log σ(u) + log σ(−u).
 * Near the upper bound θ is formed as upper − (upper − lower) σ(−u) to keep precision.
 */
export function interval(lower: number, upper: number): Support {
  const a = finite('interval.lower', lower);
  const b = finite('interval.upper', upper);
  if (!(a < b)) {
    throw new SupportArgumentError('interval.upper', upper, `a number greater than interval.lower = ${a}`);
  }
  const width = b - a;
  const logWidth = Math.log(width);
  return elementwiseSupport('interval', `interval(${a}, ${b})`, a, b, {
    forward: (u) => (u <= 0 ? a + width * logistic(u) : b - width * logistic(-u)),
    inverse: (t) => Math.log(t - a) - Math.log(b - t),
    logJacobian: (u) => logWidth + logLogistic(u) + logLogistic(-u),
    derivative: (u) => width * logistic(u) * logistic(-u),
    logJacobianDerivative: (u) => logistic(-u) - logistic(u),
    contains: (t) => t > a && t < b,
  });
}

/** The open unit interval (0, 1), the logistic map. */
export function unitInterval(): Support {
  const s = interval(0, 1);
  return { ...s, description: 'unitInterval()' };
}

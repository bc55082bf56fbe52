import { LOG_SQRT_2PI } from '../math/normalCdf.js';
import { positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Half-normal(scale) on x ≥ 0: ln p = ln 2 − ln scale − ½ ln 2π − x²/(2 scale²).
 * @param scale scale > 0 (the sd of the parent normal), in the parameter's units
 */
export function halfNormal(scale: number): ScalarPrior {
  const s = positiveArgument('halfNormal.scale', scale);
  const c = Math.LN2 - Math.log(s) - LOG_SQRT_2PI;
  const inv2 = 1 / (s * s);
  return {
    kind: 'halfNormal',
    description: `halfNormal(${s})`,
    lower: 0,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => (x >= 0 ? c - 0.5 * x * x * inv2 : -Infinity),
    logDensityDerivative: (x) => (x >= 0 ? -x * inv2 : 0),
    sample: (source) => s * Math.abs(source.normal()),
  };
}

import { LOG_SQRT_2PI } from '../math/normalCdf.js';
import { finiteArgument, positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Normal(mean, sd): ln p = −½((x − mean)/sd)² − ln sd − ½ ln 2π.
 * @param mean location, in the parameter's units
 * @param sd standard deviation > 0, in the parameter's units
 */
export function normal(mean: number, sd: number): ScalarPrior {
  const m = finiteArgument('normal.mean', mean);
  const s = positiveArgument('normal.sd', sd);
  const c = -Math.log(s) - LOG_SQRT_2PI;
  const inv2 = 1 / (s * s);
  return {
    kind: 'normal',
    description: `normal(${m}, ${s})`,
    lower: -Infinity,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => c - 0.5 * (x - m) * (x - m) * inv2,
    logDensityDerivative: (x) => -(x - m) * inv2,
    sample: (source) => m + s * source.normal(),
  };
}

import { LOG_SQRT_2PI } from '../math/normalCdf.js';
import { finiteArgument, positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Log-normal: ln x ~ Normal(logMean, logSd) on x > 0,
 * ln p = −ln x − ln logSd − ½ ln 2π − (ln x − logMean)²/(2 logSd²).
 * @param logMean mean of ln x (x in the parameter's units)
 * @param logSd standard deviation of ln x, > 0
 */
export function logNormal(logMean: number, logSd: number): ScalarPrior {
  const m = finiteArgument('logNormal.logMean', logMean);
  const s = positiveArgument('logNormal.logSd', logSd);
  const c = -Math.log(s) - LOG_SQRT_2PI;
  const inv2 = 1 / (s * s);
  return {
    kind: 'logNormal',
    description: `logNormal(${m}, ${s})`,
    lower: 0,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => {
      if (!(x > 0)) return -Infinity;
      const l = Math.log(x);
      return c - l - 0.5 * (l - m) * (l - m) * inv2;
    },
    logDensityDerivative: (x) => {
      if (!(x > 0)) return 0;
      return (-1 - (Math.log(x) - m) * inv2) / x;
    },
    sample: (source) => Math.exp(m + s * source.normal()),
  };
}

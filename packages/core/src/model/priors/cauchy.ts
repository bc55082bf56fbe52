import { finiteArgument, positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';

/**
 * Cauchy(location, scale): ln p = −ln π − ln scale − ln(1 + z²), z = (x − location)/scale.
 * Sampled by inversion, location + scale · tan(π(U − ½)).
 */
export function cauchy(location: number, scale: number): ScalarPrior {
  const m = finiteArgument('cauchy.location', location);
  const s = positiveArgument('cauchy.scale', scale);
  const c = -Math.log(Math.PI) - Math.log(s);
  return {
    kind: 'cauchy',
    description: `cauchy(${m}, ${s})`,
    lower: -Infinity,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => {
      const z = (x - m) / s;
      return c - Math.log1p(z * z);
    },
    logDensityDerivative: (x) => {
      const z = (x - m) / s;
      return (-2 * z) / (s * (1 + z * z));
    },
    sample: (source) => m + s * Math.tan(Math.PI * (source.uniform() - 0.5)),
  };
}

/**
 * Half-Cauchy(scale) on x ≥ 0: ln p = ln 2 − ln π − ln scale − ln(1 + (x/scale)²).
 * Sampled by inversion, scale · tan(πU/2).
 */
export function halfCauchy(scale: number): ScalarPrior {
  const s = positiveArgument('halfCauchy.scale', scale);
  const c = Math.LN2 - Math.log(Math.PI) - Math.log(s);
  return {
    kind: 'halfCauchy',
    description: `halfCauchy(${s})`,
    lower: 0,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => {
      if (x < 0) return -Infinity;
      const z = x / s;
      return c - Math.log1p(z * z);
    },
    logDensityDerivative: (x) => {
      if (x < 0) return 0;
      const z = x / s;
      return (-2 * z) / (s * (1 + z * z));
    },
    sample: (source) => s * Math.tan(0.5 * Math.PI * source.uniform()),
  };
}

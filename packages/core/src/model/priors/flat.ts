import type { ScalarPrior } from './prior.js';

/**
 * The improper flat prior: ln p = 0 everywhere. The posterior must be proper through
 * the likelihood. It cannot be sampled, so prior draws and prior-based initialisation
 * are unavailable for parameters using it.
 */
export function flat(): ScalarPrior {
  return {
    kind: 'flat',
    description: 'flat()',
    lower: -Infinity,
    upper: Infinity,
    proper: false,
    circular: true,
    logDensity: () => 0,
    logDensityDerivative: () => 0,
  };
}

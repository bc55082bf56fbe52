export type { Prior, RandomSource, ScalarPrior, VectorPrior } from './prior.js';
export { isVectorPrior } from './prior.js';
export type { CustomPriorSpec } from './custom.js';
import { beta } from './beta.js';
import { cauchy, halfCauchy } from './cauchy.js';
import { customPrior } from './custom.js';
import { dirichlet } from './dirichlet.js';
import { exponential } from './exponential.js';
import { flat } from './flat.js';
import { gamma, inverseGamma } from './gamma.js';
import { halfNormal } from './halfNormal.js';
import { logNormal } from './logNormal.js';
import { normal } from './normal.js';
import { studentT } from './studentT.js';
import { truncatedNormal } from './truncatedNormal.js';
import { logUniform, uniform } from './uniform.js';

/**
 * Prior distributions with exactly normalised float64 log-densities, their
 * derivatives, and samplers taking an explicit random source.
 */
export const priors = {
  normal,
  halfNormal,
  studentT,
  cauchy,
  halfCauchy,
  uniform,
  logUniform,
  logNormal,
  exponential,
  gamma,
  inverseGamma,
  beta,
  truncatedNormal,
  dirichlet,
  flat,
  custom: customPrior,
} as const;

/**
 * The whole radial-velocity log-likelihood as one TensorFlow.js op: a 1-D parameter
 * tensor (layout of `rvLikelihood.ts`) in, a scalar out, gradient from the float64
 * kernel. Its float64 value is kept in `lastValue`, so that a caller can return the
 * log-density to the sampler in float64. The op machinery is `../float64Ops.ts`.
 */
import { createFloat64ScalarOp, type Float64ScalarOp } from '../float64Ops.js';
import { OrbitParameterError } from './errors.js';
import type { RvLikelihood } from './rvLikelihood.js';

/**
 * A log-likelihood op bound to one data set: log L as a float32 scalar tensor, `exact`
 * carrying the float64 parameter values; `lastValue` and `lastGradient` are the float64
 * results of the last forward call.
 */
export type RvLikelihoodOp = Float64ScalarOp;

/** Builds an op computing `likelihood` and its gradient (forward computes both at once). */
export function createRvLikelihoodOp(likelihood: RvLikelihood): RvLikelihoodOp {
  return createFloat64ScalarOp(
    likelihood.dim,
    (params, grad) => likelihood.logLikelihoodGrad(params, grad),
    (field, value, expected) => new OrbitParameterError(field, value, expected),
  );
}

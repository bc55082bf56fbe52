/**
 * The whole radial-velocity log-likelihood as one TensorFlow.js op: a 1-D parameter
 * tensor (layout of `rvLikelihood.ts`) in, a scalar out, gradient from the float64
 * kernel. Its float64 value is kept in `lastValue`, so that a caller can return the
 * log-density to the sampler in float64.
 */
import * as tf from '@tensorflow/tfjs';
import { checkedSideChannel } from './keplerOp.js';
import { OrbitParameterError } from './errors.js';
import type { RvLikelihood } from './rvLikelihood.js';

/** A log-likelihood op bound to one data set. */
export interface RvLikelihoodOp {
  /** log L as a float32 scalar tensor; `exact` carries the float64 parameter values. */
  (params: tf.Tensor1D, exact?: Float64Array): tf.Scalar;
  /** The float64 log-likelihood of the last forward call. */
  readonly lastValue: number;
  /** The float64 gradient of the last forward call (length `dim`). */
  readonly lastGradient: Float64Array;
}

/** Builds an op computing `likelihood` and its gradient (forward computes both at once). */
export function createRvLikelihoodOp(likelihood: RvLikelihood): RvLikelihoodOp {
  const dim = likelihood.dim;
  const lastGradient = new Float64Array(dim);
  let lastValue = NaN;
  let pending: Float64Array | undefined;

  const op = tf.customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => {
    const t = args[0] as tf.Tensor;
    if (t.rank !== 1 || t.size !== dim) throw new OrbitParameterError('params.shape', JSON.stringify(t.shape), `[${dim}]`);
    const v32 = t.dataSync();
    const params = pending ? Float64Array.from(checkedSideChannel('exact', pending, v32)) : Float64Array.from(v32);
    pending = undefined;
    const g = new Float32Array(dim);
    const value = likelihood.logLikelihoodGrad(params, lastGradient);
    lastValue = value;
    for (let i = 0; i < dim; i++) g[i] = lastGradient[i];
    const gradFunc = (dy: tf.Tensor): tf.Tensor => tf.mul(dy, tf.tensor1d(g));
    return { value: tf.scalar(value), gradFunc };
  });

  const call = ((params: tf.Tensor1D, exact?: Float64Array): tf.Scalar => {
    pending = exact;
    try {
      return op(params) as tf.Scalar;
    } finally {
      pending = undefined;
    }
  }) as RvLikelihoodOp;
  Object.defineProperty(call, 'lastValue', { get: () => lastValue, enumerable: true });
  Object.defineProperty(call, 'lastGradient', { value: lastGradient, enumerable: true });
  return call;
}

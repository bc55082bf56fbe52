/**
 * The whole radial-velocity curve of all planets as one TensorFlow.js op: planet
 * parameters in (a 1-D tensor, layout of `planetParameters.ts`), the summed curve out
 * (float32, m/s), the gradient by the fused float64 vector-Jacobian product of
 * `rvCurve.ts`. Times are captured by the kernel in float64.
 */
import * as tf from '@tensorflow/tfjs';
import { checkedSideChannel } from './keplerOp.js';
import { OrbitParameterError } from './errors.js';
import type { RvCurveKernel } from './rvCurve.js';

/** A radial-velocity curve op bound to one kernel (one set of times). */
export interface RvCurveOp {
  /**
   * Returns the curve (float32 tensor of length times.length, m/s). `exact` carries the
   * float64 values of `params` (the side channel); without it the tensor's float32
   * values are used. Out-of-support parameters give a curve of NaN (zero gradient).
   */
  (params: tf.Tensor1D, exact?: Float64Array): tf.Tensor1D;
  /** The float64 curve of the last forward call (m/s), for float64 likelihood sums. */
  readonly lastCurve: Float64Array;
}

/** Builds an op computing `kernel`'s curve and its exact gradient. */
export function createRvCurveOp(kernel: RvCurveKernel): RvCurveOp {
  const N = kernel.times.length;
  const dim = kernel.parameterCount;
  const curve = new Float64Array(N);
  const weights = new Float64Array(N);
  const grad = new Float64Array(dim);
  const scratchCurve = new Float64Array(N);
  let pending: Float64Array | undefined;
  let generation = 0;

  const op = tf.customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => {
    const t = args[0] as tf.Tensor;
    if (t.rank !== 1 || t.size !== dim) {
      throw new OrbitParameterError('params.shape', JSON.stringify(t.shape), `[${dim}]`);
    }
    const v32 = t.dataSync();
    const params = pending ? Float64Array.from(checkedSideChannel('exact', pending, v32)) : Float64Array.from(v32);
    pending = undefined;
    const ok = kernel.valueForGradient(params, curve);
    const mine = ++generation;
    const out = new Float32Array(N);
    if (ok) for (let i = 0; i < N; i++) out[i] = curve[i];
    else out.fill(NaN);
    if (!ok) curve.fill(NaN);
    const gradFunc = (dy: tf.Tensor): tf.Tensor => {
      if (!ok) return tf.zeros([dim]);
      // Another forward call of this op may have replaced the kernel's cache.
      if (generation !== mine) {
        kernel.valueForGradient(params, scratchCurve);
        ++generation; // the cache now holds these parameters, which no closure owns
      }
      const g = dy.dataSync();
      for (let i = 0; i < N; i++) weights[i] = g[i];
      kernel.vjpFromLastValue(weights, grad);
      return tf.tensor1d(Float32Array.from(grad));
    };
    return { value: tf.tensor1d(out), gradFunc };
  });

  const call = ((params: tf.Tensor1D, exact?: Float64Array): tf.Tensor1D => {
    pending = exact;
    try {
      return op(params) as tf.Tensor1D;
    } finally {
      pending = undefined;
    }
  }) as RvCurveOp;
  Object.defineProperty(call, 'lastCurve', { value: curve, enumerable: true });
  return call;
}

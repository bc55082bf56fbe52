/**
 * The whole radial-velocity curve of all planets as one TensorFlow.js op: planet
 * parameters in (a 1-D tensor, layout of `planetParameters.ts`), the summed curve out
 * (float32, m/s), the gradient by the fused float64 vector-Jacobian product of
 * `rvCurve.ts`. Times are captured by the kernel in float64. The op machinery (side
 * channel, kept Jacobian) is `../float64Ops.ts`.
 */
import type * as tf from '@tensorflow/tfjs';
import { createFloat64VectorOp } from '../float64Ops.js';
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
  const op = createFloat64VectorOp(
    {
      dim: kernel.parameterCount,
      length: kernel.times.length,
      forwardKeeping: (params, out) => kernel.valueForGradient(params, out),
      vjpFromLast: (weights, grad) => kernel.vjpFromLastValue(weights, grad),
    },
    (field, value, expected) => new OrbitParameterError(field, value, expected),
  );
  const call = ((params: tf.Tensor1D, exact?: Float64Array) => op(params, exact)) as RvCurveOp;
  Object.defineProperty(call, 'lastCurve', { value: op.lastOutput, enumerable: true });
  return call;
}

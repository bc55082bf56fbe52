/**
 * TensorFlow.js ops over fused float64 kernels (`tf.customGrad`), shared by the orbit and
 * transit ops: a 1-D parameter tensor in, a float32 vector (a curve) or scalar (a
 * log-likelihood) out; values and gradients computed in float64 JS, only the results
 * cast to float32. Each op takes the exact float64 parameters through the side channel
 * (`sideChannel.ts`): the call's `exact` array, checked against the tensor.
 */
import type * as tf from '@tensorflow/tfjs';
import { requireTensorFlow } from '@apsis/core';
import { sideChannelMismatch } from './sideChannel.js';

/** Builds the error an op throws: the field, the value found, what was expected. */
export type OpErrorFactory = (field: string, value: unknown, expected: string) => Error;

/** The float64 parameters of one call: the side channel if given (checked), else the tensor's values. */
function callParameters(t: tf.Tensor, dim: number, exact: Float64Array | undefined, error: OpErrorFactory): Float64Array {
  if (t.rank !== 1 || t.size !== dim) throw error('params.shape', JSON.stringify(t.shape), `[${dim}]`);
  const values = t.dataSync();
  if (!exact) return Float64Array.from(values);
  if (!(exact instanceof Float64Array) || exact.length !== values.length) {
    throw error('exact.length', exact instanceof Float64Array ? exact.length : exact, `a Float64Array of length ${values.length} (the tensor's size)`);
  }
  const i = sideChannelMismatch(exact, values);
  if (i >= 0) throw error(`exact[${i}]`, exact[i], `a float64 value matching the tensor's ${values[i]}`);
  return Float64Array.from(exact);
}

/** Wraps a customGrad function so that each call can pass its float64 side channel. */
function withSideChannel<R extends tf.Tensor>(body: (t: tf.Tensor, exact: Float64Array | undefined) => { value: R; gradFunc: (dy: tf.Tensor) => tf.Tensor }) {
  let pending: Float64Array | undefined;
  const op = requireTensorFlow().customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => {
    const exact = pending;
    pending = undefined;
    return body(args[0] as tf.Tensor, exact);
  });
  return (params: tf.Tensor1D, exact?: Float64Array): R => {
    pending = exact;
    try {
      return op(params) as R;
    } finally {
      pending = undefined;
    }
  };
}

/** A float64 kernel with a vector output whose Jacobian it keeps for one later product. */
export interface KeptJacobianKernel {
  /** Parameters per call. */
  readonly dim: number;
  /** Output length. */
  readonly length: number;
  /** Writes the output into `out` and keeps what the product needs; false outside the support. */
  forwardKeeping(params: Float64Array, out: Float64Array): boolean;
  /** grad = Jᵀ weights for the Jacobian kept by the last `forwardKeeping`. */
  vjpFromLast(weights: Float64Array, grad: Float64Array): void;
}

/** A vector op; `lastOutput` is the float64 output of the last forward call (NaN outside the support). */
export interface Float64VectorOp {
  (params: tf.Tensor1D, exact?: Float64Array): tf.Tensor1D;
  readonly lastOutput: Float64Array;
}

/**
 * A vector op over `kernel`. Outside the support the output is NaN and the gradient zero.
 * A later forward call replaces the kernel's kept Jacobian, so a gradient asked for an
 * earlier call recomputes it first (a generation counter tells).
 */
export function createFloat64VectorOp(kernel: KeptJacobianKernel, error: OpErrorFactory): Float64VectorOp {
  const { dim, length: N } = kernel;
  const last = new Float64Array(N);
  const scratch = new Float64Array(N);
  const weights = new Float64Array(N);
  const grad = new Float64Array(dim);
  let generation = 0;

  const call = withSideChannel((t, exact) => {
    const params = callParameters(t, dim, exact, error);
    const ok = kernel.forwardKeeping(params, last);
    const mine = ++generation;
    if (!ok) last.fill(NaN);
    const out = Float32Array.from(last);
    const tfjs = requireTensorFlow();
    const gradFunc = (dy: tf.Tensor): tf.Tensor => {
      if (!ok) return tfjs.zeros([dim]);
      if (generation !== mine) {
        kernel.forwardKeeping(params, scratch);
        ++generation; // the kept Jacobian now belongs to no call's closure
      }
      const g = dy.dataSync();
      for (let i = 0; i < N; i++) weights[i] = g[i];
      kernel.vjpFromLast(weights, grad);
      return tfjs.tensor1d(Float32Array.from(grad));
    };
    return { value: tfjs.tensor1d(out), gradFunc };
  }) as Float64VectorOp;
  Object.defineProperty(call, 'lastOutput', { value: last, enumerable: true });
  return call;
}

/** A scalar op; `lastValue` and `lastGradient` are the float64 results of the last forward call. */
export interface Float64ScalarOp {
  (params: tf.Tensor1D, exact?: Float64Array): tf.Scalar;
  readonly lastValue: number;
  readonly lastGradient: Float64Array;
}

/** A scalar op whose forward pass computes the value and its gradient at once (`valueAndGradient`). */
export function createFloat64ScalarOp(dim: number, valueAndGradient: (params: Float64Array, grad: Float64Array) => number, error: OpErrorFactory): Float64ScalarOp {
  const lastGradient = new Float64Array(dim);
  let lastValue = Number.NaN;
  const call = withSideChannel((t, exact) => {
    const params = callParameters(t, dim, exact, error);
    lastValue = valueAndGradient(params, lastGradient);
    const g32 = Float32Array.from(lastGradient);
    const tfjs = requireTensorFlow();
    return { value: tfjs.scalar(lastValue), gradFunc: (dy: tf.Tensor): tf.Tensor => tfjs.mul(dy, tfjs.tensor1d(g32)) };
  }) as Float64ScalarOp;
  Object.defineProperty(call, 'lastValue', { get: () => lastValue, enumerable: true });
  Object.defineProperty(call, 'lastGradient', { value: lastGradient, enumerable: true });
  return call;
}

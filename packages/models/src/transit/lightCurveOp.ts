/**
 * TensorFlow.js ops over the float64 transit kernels (`tf.customGrad`): the light
 * curve (parameters in, float32 flux out) and the light-curve log-likelihood
 * (parameters in, float32 scalar out). Forward values and gradients are computed in
 * float64 JS; only the results cross into float32.
 *
 * Float64 side channel (DESIGN.md, numerics policy): a tensor holds float32, which
 * cannot resolve a period or transit time finely enough, so each op accepts the same
 * parameters as a `Float64Array` (`exact`) and runs on those, after checking that
 * they agree with the tensor's values; the gradient still flows through the tensor.
 */
import * as tf from '@tensorflow/tfjs';
import { SIDE_CHANNEL_TOLERANCE, sideChannelMismatch } from '../sideChannel.js';
import { TransitWorkspaceError } from './errors.js';
import type { LightCurveKernel } from './lightCurve.js';
import type { LightCurveLikelihood } from './lightCurveLikelihood.js';

/** Relative agreement required between the float64 side channel and the tensor (shared with the orbit ops). */
export const TRANSIT_SIDE_CHANNEL_TOLERANCE = SIDE_CHANNEL_TOLERANCE;

function parameters(field: string, tensorValues: ArrayLike<number>, exact: Float64Array | undefined): Float64Array {
  if (!exact) return Float64Array.from(tensorValues);
  if (!(exact instanceof Float64Array) || exact.length !== tensorValues.length) {
    throw new TransitWorkspaceError(`${field}.length`, exact, `a Float64Array of length ${tensorValues.length} (the tensor's size)`);
  }
  const i = sideChannelMismatch(exact, tensorValues);
  if (i >= 0) {
    throw new TransitWorkspaceError(`${field}[${i}]`, exact[i], `a float64 value matching the tensor's ${tensorValues[i]}`);
  }
  return Float64Array.from(exact);
}

function checkShape(t: tf.Tensor, dim: number): void {
  if (t.rank !== 1 || t.size !== dim) throw new TransitWorkspaceError('params.shape', JSON.stringify(t.shape), `[${dim}]`);
}

/** A light-curve op bound to one kernel (one set of times). */
export interface LightCurveOp {
  /**
   * Relative flux at the kernel's times (float32 tensor of length N). `exact` carries
   * the float64 values of `params`. Parameters outside their support give a flux of
   * NaN and a zero gradient.
   */
  (params: tf.Tensor1D, exact?: Float64Array): tf.Tensor1D;
  /** The float64 flux of the last forward call. */
  readonly lastFlux: Float64Array;
}

/** Builds the light-curve op of `kernel`, gradient by its fused vector-Jacobian product. */
export function createLightCurveOp(kernel: LightCurveKernel): LightCurveOp {
  const N = kernel.times.length;
  const dim = kernel.parameterCount;
  const last = new Float64Array(N);
  const weights = new Float64Array(N);
  const grad = new Float64Array(dim);
  let pending: Float64Array | undefined;
  let generation = 0;

  const op = tf.customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => {
    const t = args[0] as tf.Tensor;
    checkShape(t, dim);
    const params = parameters('exact', t.dataSync(), pending);
    pending = undefined;
    const flux = kernel.fluxKeepingJacobian(params);
    const mine = ++generation;
    const out = new Float32Array(N);
    if (flux) {
      last.set(flux);
      for (let i = 0; i < N; i++) out[i] = flux[i];
    } else {
      last.fill(NaN);
      out.fill(NaN);
    }
    const gradFunc = (dy: tf.Tensor): tf.Tensor => {
      if (!flux) return tf.zeros([dim]);
      // A later forward call may have replaced the kernel's kept Jacobian.
      if (generation !== mine) {
        kernel.fluxKeepingJacobian(params);
        ++generation;
      }
      const g = dy.dataSync();
      for (let i = 0; i < N; i++) weights[i] = g[i];
      kernel.vjpFromLast(weights, grad);
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
  }) as LightCurveOp;
  Object.defineProperty(call, 'lastFlux', { value: last, enumerable: true });
  return call;
}

/** A light-curve log-likelihood op (one data set). */
export interface LightCurveLikelihoodOp {
  /**
   * log L as a float32 scalar tensor; -Infinity (zero gradient) outside the support.
   * `exact` carries the float64 values of `params`.
   */
  (params: tf.Tensor1D, exact?: Float64Array): tf.Scalar;
  /** The float64 log-likelihood of the last forward call (for float64 sums). */
  readonly lastValue: number;
}

/** Builds the log-likelihood op of `likelihood`, gradient computed in float64. */
export function createLightCurveLikelihoodOp(likelihood: LightCurveLikelihood): LightCurveLikelihoodOp {
  const dim = likelihood.dim;
  const grad = new Float64Array(dim);
  let pending: Float64Array | undefined;
  let lastValue = Number.NaN;

  const op = tf.customGrad((...args: Array<tf.Tensor | tf.GradSaveFunc>) => {
    const t = args[0] as tf.Tensor;
    checkShape(t, dim);
    const params = parameters('exact', t.dataSync(), pending);
    pending = undefined;
    const value = likelihood.logLikelihoodGrad(params, grad);
    lastValue = value;
    const g32 = Float32Array.from(grad);
    const gradFunc = (dy: tf.Tensor): tf.Tensor => tf.mul(dy, tf.tensor1d(g32));
    return { value: tf.scalar(value), gradFunc };
  });

  const call = ((params: tf.Tensor1D, exact?: Float64Array): tf.Scalar => {
    pending = exact;
    try {
      return op(params) as tf.Scalar;
    } finally {
      pending = undefined;
    }
  }) as LightCurveLikelihoodOp;
  Object.defineProperty(call, 'lastValue', { get: () => lastValue, enumerable: true });
  return call;
}

/**
 * TensorFlow.js ops over the float64 transit kernels: the light curve (parameters in,
 * float32 flux out) and the light-curve log-likelihood (parameters in, float32 scalar
 * out). Forward values and gradients are computed in float64 JS; only the results
 * cross into float32. The op machinery (float64 side channel checked against the
 * tensor, DESIGN.md numerics policy; the kept Jacobian) is `../float64Ops.ts`.
 */
import type * as tf from '@tensorflow/tfjs';
import { createFloat64ScalarOp, createFloat64VectorOp, type Float64ScalarOp } from '../float64Ops.js';
import { SIDE_CHANNEL_TOLERANCE } from '../sideChannel.js';
import { TransitWorkspaceError } from './errors.js';
import type { LightCurveKernel } from './lightCurve.js';
import type { LightCurveLikelihood } from './lightCurveLikelihood.js';

/** Relative agreement required between the float64 side channel and the tensor (shared with the orbit ops). */
export const TRANSIT_SIDE_CHANNEL_TOLERANCE = SIDE_CHANNEL_TOLERANCE;

const transitError = (field: string, value: unknown, expected: string): Error => new TransitWorkspaceError(field, value, expected);

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
  const op = createFloat64VectorOp(
    {
      dim: kernel.parameterCount,
      length: kernel.times.length,
      forwardKeeping(params, out) {
        const flux = kernel.fluxKeepingJacobian(params);
        if (flux) out.set(flux);
        return flux !== null;
      },
      vjpFromLast: (weights, grad) => kernel.vjpFromLast(weights, grad),
    },
    transitError,
  );
  const call = ((params: tf.Tensor1D, exact?: Float64Array) => op(params, exact)) as LightCurveOp;
  Object.defineProperty(call, 'lastFlux', { value: op.lastOutput, enumerable: true });
  return call;
}

/**
 * A light-curve log-likelihood op (one data set): log L as a float32 scalar tensor,
 * -Infinity (zero gradient) outside the support; `exact` carries the float64 values of
 * `params`; `lastValue` is the float64 log-likelihood of the last forward call.
 */
export type LightCurveLikelihoodOp = Float64ScalarOp;

/** Builds the log-likelihood op of `likelihood`, gradient computed in float64. */
export function createLightCurveLikelihoodOp(likelihood: LightCurveLikelihood): LightCurveLikelihoodOp {
  return createFloat64ScalarOp(likelihood.dim, (params, grad) => likelihood.logLikelihoodGrad(params, grad), transitError);
}

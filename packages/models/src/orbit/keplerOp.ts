/**
 * Kepler's equation as a TensorFlow.js op with the implicit-function gradient,
 * computed in float64 inside: E = solveKeplerOp(M, e).
 *
 * Gradients (implicit function theorem on M = E - e sin E):
 *   dE/dM = 1 / (1 - e cos E),  dE/de = sin E / (1 - e cos E).
 */
import type * as tf from '@tensorflow/tfjs';
import { requireTensorFlow } from '@apsis/core';
import { sideChannelMismatch } from '../sideChannel.js';
import { OrbitParameterError } from './errors.js';
import { solveKeplerInto } from './kepler.js';

/** Exact float64 values of the op's inputs, when the caller has them (the side channel). */
export interface KeplerOpExact {
  /** The mean anomalies in float64, same length as the tensor (row-major). */
  meanAnomaly?: Float64Array;
  /** The eccentricity (or one per element) in float64. */
  eccentricity?: number | Float64Array;
}

export { SIDE_CHANNEL_TOLERANCE } from '../sideChannel.js';

/**
 * Checks that the float64 side-channel values agree with the float32 tensor values
 * they stand for (to `SIDE_CHANNEL_TOLERANCE`), and returns them.
 */
export function checkedSideChannel(field: string, exact: Float64Array, tensorValues: ArrayLike<number>): Float64Array {
  if (exact.length !== tensorValues.length) {
    throw new OrbitParameterError(`${field}.length`, exact.length, `${tensorValues.length} (the tensor's size)`);
  }
  const i = sideChannelMismatch(exact, tensorValues);
  if (i >= 0) {
    throw new OrbitParameterError(`${field}[${i}]`, exact[i], `a float64 value matching the tensor's ${tensorValues[i]}`);
  }
  return exact;
}

let pending: KeplerOpExact | undefined;

/** The kernel as a customGrad function, created on first use (TensorFlow.js loads then). */
function keplerKernel(...args: Array<tf.Tensor | tf.GradSaveFunc>): { value: tf.Tensor; gradFunc: (dy: tf.Tensor) => tf.Tensor[] } {
  const tfjs = requireTensorFlow();
  const M = args[0] as tf.Tensor;
  const eT = args[1] as tf.Tensor;
  const exact = pending;
  pending = undefined;
  const n = M.size;
  const scalarE = eT.size === 1;
  if (!scalarE && (eT.size !== n || eT.rank !== M.rank || eT.shape.some((d, i) => d !== M.shape[i]))) {
    throw new OrbitParameterError('eccentricity.shape', JSON.stringify(eT.shape), `[] or the mean anomaly's shape ${JSON.stringify(M.shape)}`);
  }
  const m32 = M.dataSync();
  const e32 = eT.dataSync();
  const m = exact?.meanAnomaly ? checkedSideChannel('exact.meanAnomaly', exact.meanAnomaly, m32) : Float64Array.from(m32);
  let e: Float64Array;
  if (typeof exact?.eccentricity === 'number') e = checkedSideChannel('exact.eccentricity', Float64Array.of(exact.eccentricity), e32);
  else if (exact?.eccentricity) e = checkedSideChannel('exact.eccentricity', exact.eccentricity, e32);
  else e = Float64Array.from(e32);
  for (let i = 0; i < e.length; i++) {
    if (!(e[i] >= 0 && e[i] < 1)) throw new OrbitParameterError(`eccentricity[${i}]`, e[i], 'a number in [0, 1)');
  }
  const E = new Float32Array(n);
  const dEdM = new Float64Array(n);
  const dEde = new Float64Array(n);
  const s = new Float64Array(3);
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(m[i])) throw new OrbitParameterError(`meanAnomaly[${i}]`, m[i], 'a finite number (radians)');
    const ei = scalarE ? e[0] : e[i];
    solveKeplerInto(m[i], ei, s, 0);
    const inv = 1 / (1 - ei * s[2]);
    E[i] = s[0];
    dEdM[i] = inv;
    dEde[i] = s[1] * inv;
  }
  const value = tfjs.tensor(E, M.shape);
  const gradFunc = (dy: tf.Tensor): tf.Tensor[] => {
    const g = dy.dataSync();
    const gM = new Float32Array(n);
    let gEsum = 0;
    const gE = scalarE ? null : new Float32Array(n);
    for (let i = 0; i < n; i++) {
      gM[i] = g[i] * dEdM[i];
      if (gE) gE[i] = g[i] * dEde[i];
      else gEsum += g[i] * dEde[i];
    }
    return [tfjs.tensor(gM, M.shape), gE ? tfjs.tensor(gE, eT.shape) : tfjs.fill(eT.shape, gEsum)];
  };
  return { value, gradFunc };
}

let keplerGrad: ((m: tf.Tensor, e: tf.Tensor) => tf.Tensor) | undefined;

/**
 * Eccentric anomaly E (radians, float32 tensor of M's shape) solving M = E - e sin E,
 * differentiable in M and e. Computed in float64 from the tensors' values, or from
 * `exact` when given (the float64 side channel; checked against the tensors).
 *
 * @param meanAnomaly mean anomalies, radians, any shape.
 * @param eccentricity scalar tensor or one per element (same shape), 0 <= e < 1.
 */
export function solveKeplerOp(meanAnomaly: tf.Tensor, eccentricity: tf.Tensor, exact?: KeplerOpExact): tf.Tensor {
  keplerGrad ??= requireTensorFlow().customGrad(keplerKernel) as (m: tf.Tensor, e: tf.Tensor) => tf.Tensor;
  pending = exact;
  try {
    return keplerGrad(meanAnomaly, eccentricity);
  } finally {
    pending = undefined;
  }
}

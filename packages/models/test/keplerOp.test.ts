import * as tf from '@tensorflow/tfjs';
import { beforeAll, describe, expect, it } from 'vitest';
import { OrbitParameterError, solveKepler, solveKeplerOp } from '../src/orbit/index.js';

beforeAll(async () => {
  await tf.setBackend('cpu');
});

/** Float32 relative accuracy of a value that went through one float32 rounding (plus margin). */
const F32 = 2 ** -23;

describe('Kepler TensorFlow.js op', () => {
  const M = [-9.5, -2, -1e-3, 0.01, 0.5, 1.5, 3.1, 8];
  const weights = [0.3, -1.2, 0.7, 2.0, -0.4, 1.1, 0.9, -0.6];

  it('forward equals the float64 solver rounded to float32', () => {
    for (const e of [0, 0.3, 0.95]) {
      const E = solveKeplerOp(tf.tensor1d(M), tf.scalar(e), { meanAnomaly: Float64Array.from(M), eccentricity: e });
      const v = E.dataSync();
      M.forEach((m, i) => expect(v[i]).toBe(Math.fround(solveKepler(m, e))));
      E.dispose();
    }
  });

  it('gradients inside tf.valueAndGrad match float64 central differences to float32 accuracy', () => {
    // Implicit function theorem gradients vs central differences of the float64 solver.
    for (const e of [1e-8, 0.3, 0.95]) {
      const w = tf.tensor1d(weights);
      const f = (m: tf.Tensor, ecc: tf.Tensor) => tf.sum(tf.mul(w, solveKeplerOp(m, ecc)));
      const { grads } = tf.tidy(() => {
        const r = tf.valueAndGrads((m: tf.Tensor, ecc: tf.Tensor) => f(m, ecc) as tf.Scalar)([tf.tensor1d(M), tf.scalar(e)]);
        return { grads: r.grads.map((g) => g.dataSync().slice()) };
      });
      const m32 = M.map(Math.fround);
      const e32 = Math.fround(e);
      const L = (ms: number[], ecc: number) => ms.reduce((s, m, i) => s + weights[i] * solveKepler(m, ecc), 0);
      m32.forEach((m, i) => {
        const h = 1e-6;
        const dE = (solveKepler(m + h, e32) - solveKepler(m - h, e32)) / (2 * h);
        expect(Math.abs(grads[0][i] - weights[i] * dE)).toBeLessThan(8 * F32 * Math.abs(weights[i] * dE) + 1e-9);
      });
      const he = Math.min(1e-7, e32 / 4);
      const dL = (L(m32, e32 + he) - L(m32, e32 - he)) / (2 * he);
      expect(Math.abs(grads[1][0] - dL)).toBeLessThan(1e-6 * (1 + Math.abs(dL)));
      w.dispose();
    }
  });

  it('takes one eccentricity per element and sums nothing then', () => {
    const e = [0.1, 0.5, 0.9];
    const ms = [0.2, 1, 2];
    const g = tf.tidy(() => tf.grad((ecc: tf.Tensor) => tf.sum(solveKeplerOp(tf.tensor1d(ms), ecc)))(tf.tensor1d(e)).dataSync().slice());
    ms.forEach((m, i) => {
      const E = solveKepler(m, Math.fround(e[i]));
      const expected = Math.sin(E) / (1 - Math.fround(e[i]) * Math.cos(E));
      expect(Math.abs(g[i] - expected)).toBeLessThan(8 * F32 * Math.abs(expected));
    });
  });

  it('uses the float64 side channel: the result follows the exact mean anomaly, not its float32 copy', () => {
    // A mean anomaly of 1000.123456789 rad: float32 spacing there is 6.1e-5 rad.
    const exact = 1000.123456789;
    const E = solveKeplerOp(tf.tensor1d([exact]), tf.scalar(0.2), { meanAnomaly: Float64Array.of(exact) });
    const fromExact = Math.fround(solveKepler(exact, 0.2));
    const fromF32 = Math.fround(solveKepler(Math.fround(exact), 0.2));
    expect(fromExact).not.toBe(fromF32);
    expect(E.dataSync()[0]).toBe(fromExact);
    E.dispose();
    // A side channel that does not match its tensor is refused.
    expect(() => solveKeplerOp(tf.tensor1d([1]), tf.scalar(0.2), { meanAnomaly: Float64Array.of(2) })).toThrow(OrbitParameterError);
    expect(() => solveKeplerOp(tf.tensor1d([1]), tf.scalar(1.2))).toThrow(/eccentricity\[0\]/);
    expect(() => solveKeplerOp(tf.tensor1d([1, 2]), tf.tensor1d([0.1, 0.2, 0.3]))).toThrow(/eccentricity.shape/);
  });

  it('leaks no tensors over 1e4 gradient calls', () => {
    const m = tf.tensor1d(M);
    const e = tf.scalar(0.4);
    const vg = tf.valueAndGrads((a: tf.Tensor, b: tf.Tensor) => tf.sum(tf.square(solveKeplerOp(a, b))) as tf.Scalar);
    const step = () => tf.tidy(() => {
      const r = vg([m, e]);
      return r.value.dataSync()[0] + r.grads[1].dataSync()[0];
    });
    step();
    const before = tf.memory().numTensors;
    for (let i = 0; i < 10000; i++) step();
    expect(tf.memory().numTensors).toBe(before);
    m.dispose();
    e.dispose();
  });
});

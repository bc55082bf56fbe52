import * as tf from '@tensorflow/tfjs';
import { beforeAll, describe, expect, it } from 'vitest';
import { createLightCurveKernel } from '../src/transit/lightCurve.js';
import { createLightCurveLikelihood } from '../src/transit/lightCurveLikelihood.js';
import { createLightCurveLikelihoodOp, createLightCurveOp } from '../src/transit/lightCurveOp.js';

beforeAll(async () => {
  await tf.setBackend('cpu');
});

// Invented scenario: one planet, times relative to a reference epoch near the data's middle.
const times = Float64Array.from({ length: 800 }, (_, i) => -0.2 + (0.4 * i) / 799);
const params = Float64Array.from([4.3, 0.0123456789, 0.1, 0.7, 11, 0.3, 0.1, 0.35, 0.2]);
const weights = Float32Array.from(times, (_, i) => Math.cos(0.05 * i));

describe('light-curve TensorFlow.js op', () => {
  const kernel = createLightCurveKernel({ times, planets: 1, exposureTime: 0.01, subSamples: 3 });
  const op = createLightCurveOp(kernel);

  it('gives the float64 flux and, inside tf.valueAndGrad, gradients matching central differences', () => {
    const w = tf.tensor1d(weights);
    const f = (p: tf.Tensor1D) => tf.sum(tf.mul(op(p, params), w)) as tf.Scalar;
    const { value, grad: grads } = tf.tidy(() => tf.valueAndGrad(f)(tf.tensor1d(Float32Array.from(params))));
    const g = grads.dataSync();
    const objective = (p: Float64Array) => kernel.flux(p).reduce((s, fi, i) => s + weights[i] * fi, 0);
    expect(Math.abs(value.dataSync()[0] - objective(params))).toBeLessThan(1e-3);
    for (let j = 0; j < params.length; j++) {
      const h = 1e-6 * Math.max(1, Math.abs(params[j]));
      const plus = Float64Array.from(params);
      const minus = Float64Array.from(params);
      plus[j] += h;
      minus[j] -= h;
      const fd = (objective(plus) - objective(minus)) / (2 * h);
      expect(Math.abs(g[j] - fd), kernel.names[j]).toBeLessThan(1e-4 * Math.max(1, Math.abs(fd)));
    }
    tf.dispose([value, grads, w]);
  });

  it('runs on the float64 side channel, not the float32 tensor values', () => {
    const p32 = tf.tensor1d(Float32Array.from(params));
    const out = op(p32, params);
    const direct = kernel.flux(params);
    for (let i = 0; i < times.length; i++) expect(Math.abs(op.lastFlux[i] - direct[i])).toBeLessThan(1e-15);
    // The float32 tensor alone would move tc by its rounding (about 5e-10 d here).
    expect(Math.fround(params[1])).not.toBe(params[1]);
    tf.dispose([p32, out]);
    const wrong = Float64Array.from(params);
    wrong[0] += 1;
    expect(() => tf.tidy(() => op(tf.tensor1d(Float32Array.from(params)), wrong))).toThrow(/exact\[0\]/);
  });

  it('gives NaN and a zero gradient outside the support', () => {
    const bad = Float32Array.from(params);
    bad[2] = 1.5;
    const w = tf.tensor1d(weights);
    const { value, grad: grads } = tf.tidy(() => tf.valueAndGrad((p: tf.Tensor1D) => tf.sum(tf.mul(op(p), w)) as tf.Scalar)(tf.tensor1d(bad)));
    expect(Number.isNaN(value.dataSync()[0])).toBe(true);
    expect(Array.from(grads.dataSync()).every((x) => x === 0)).toBe(true);
    tf.dispose([value, grads, w]);
  });

  it('leaks no tensors over repeated value-and-gradient calls', () => {
    const w = tf.tensor1d(weights);
    const vg = tf.valueAndGrad((p: tf.Tensor1D) => tf.sum(tf.mul(op(p, params), w)) as tf.Scalar);
    const run = () => {
      const r = tf.tidy(() => {
        const { value, grad: grads } = vg(tf.tensor1d(Float32Array.from(params)));
        return [value, grads];
      });
      tf.dispose(r);
    };
    run();
    const before = tf.memory().numTensors;
    for (let i = 0; i < 50; i++) run();
    expect(tf.memory().numTensors).toBe(before);
    w.dispose();
  });
});

describe('light-curve log-likelihood TensorFlow.js op', () => {
  const flux = Float64Array.from(times, (_, i) => 1 + 3e-4 * Math.sin(3.1 * i));
  const errors = new Float64Array(times.length).fill(5e-4);
  const like = createLightCurveLikelihood({ times, flux, errors, planets: 1 });
  const op = createLightCurveLikelihoodOp(like);
  const full = Float64Array.from([...params, 1.0001, 2e-4]);

  it('returns the float64 value and gradient through tf.valueAndGrad, without leaks', () => {
    const grad64 = new Float64Array(like.dim);
    const value64 = like.logLikelihoodGrad(full, grad64);
    const vg = tf.valueAndGrad((p: tf.Tensor1D) => op(p, full));
    const once = () => {
      const r = tf.tidy(() => {
        const { value, grad: grads } = vg(tf.tensor1d(Float32Array.from(full)));
        return [value, grads];
      });
      const v = r[0].dataSync()[0];
      const g = r[1].dataSync();
      tf.dispose(r);
      return { v, g };
    };
    const { v, g } = once();
    expect(op.lastValue).toBe(value64);
    expect(Math.abs(v - value64)).toBeLessThan(1e-6 * Math.abs(value64));
    for (let j = 0; j < like.dim; j++) expect(Math.abs(g[j] - grad64[j])).toBeLessThan(1e-6 * Math.max(1, Math.abs(grad64[j])));
    const before = tf.memory().numTensors;
    for (let i = 0; i < 30; i++) once();
    expect(tf.memory().numTensors).toBe(before);
  });
});

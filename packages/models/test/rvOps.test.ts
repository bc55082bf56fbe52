import * as tf from '@tensorflow/tfjs';
import { beforeAll, describe, expect, it } from 'vitest';
import {
  createRvCurveKernel,
  createRvCurveOp,
  createRvLikelihood,
  createRvLikelihoodOp,
} from '../src/orbit/index.js';

beforeAll(async () => {
  await tf.setBackend('cpu');
});

const N = 80;
const times = Float64Array.from({ length: N }, (_, i) => -400 + 10 * i + 3 * Math.sin(i));
const weights = Float64Array.from({ length: N }, (_, i) => Math.cos(0.9 * i) + 0.1);
// Two planets: [P, tc, e, omega, K] each; the second one strongly eccentric.
const params = Float64Array.of(12.3, 1.2, 0.3, 1.1, 35, 101.7, -20, 0.95, 2.5, 8);

function derivative(f: (x: number) => number, x: number, h: number): number {
  return (-f(x + 2 * h) + 8 * f(x + h) - 8 * f(x - h) + f(x - 2 * h)) / (12 * h);
}

describe('RV curve TensorFlow.js op', () => {
  it('gradient of a TF.js function of the curve matches float64 central differences to float32 accuracy', () => {
    // L = sum_i w_i v_i^2 / 100, differentiated through the op by tf.valueAndGrad.
    const kernel = createRvCurveKernel({ times, planets: 2 });
    const op = createRvCurveOp(kernel);
    const w = tf.tensor1d(Float32Array.from(weights));
    const { value, grad } = tf.tidy(() => {
      const r = tf.valueAndGrad((p: tf.Tensor) => tf.div(tf.sum(tf.mul(w, tf.square(op(p as tf.Tensor1D, params)))), 100) as tf.Scalar)(
        tf.tensor1d(Float32Array.from(params)),
      );
      return { value: r.value.dataSync()[0], grad: r.grad.dataSync().slice() };
    });
    const out = new Float64Array(N);
    const L = (q: Float64Array) => {
      kernel.value(q, out);
      let s = 0;
      for (let i = 0; i < N; i++) s += (weights[i] * out[i] * out[i]) / 100;
      return s;
    };
    expect(Math.abs(value - L(params))).toBeLessThan(1e-5 * Math.abs(L(params)));
    const steps = [1e-6, 1e-5, 1e-5, 1e-5, 1e-4];
    for (let j = 0; j < params.length; j++) {
      const h = steps[j % 5] * (j % 5 === 0 ? params[j] : 1) * (j === 7 ? 0.1 : 1);
      const fd = derivative((x) => {
        const q = params.slice();
        q[j] = x;
        return L(q);
      }, params[j], h);
      // Float32 accuracy: the weights dL/dv_i cross TF.js in float32, so allow a few
      // float32 ulps of the sum of |terms| (bounded here by 1e-5 of the largest gradient scale).
      expect(Math.abs(grad[j] - fd), `slot ${j}: ${grad[j]} vs ${fd}`).toBeLessThan(2e-5 * (1 + Math.abs(fd)));
    }
    w.dispose();
  });

  it('the float64 side channel resolves a period change below the float32 spacing', () => {
    // Float32 spacing at P = 3.2 d is 2.4e-7 d (DESIGN.md); over 1000 d that is a phase shift
    // of 2 pi * 1000 * 2.4e-7 / 3.2^2 ~ 1.5e-4 rad, well above float32 rounding of the curve.
    const tLong = Float64Array.from({ length: 50 }, (_, i) => 1000 + i * 0.137);
    const op = createRvCurveOp(createRvCurveKernel({ times: tLong, planets: 1 }));
    const a = Float64Array.of(3.2, 0.1, 0.1, 0.5, 100);
    const b = a.slice();
    b[0] += 5e-8; // below half the float32 spacing: same float32 tensor
    expect(Math.fround(a[0])).toBe(Math.fround(b[0]));
    const t = tf.tensor1d(Float32Array.from(a));
    const va = op(t, a).dataSync().slice();
    const vb = op(t, b).dataSync().slice();
    let maxDiff = 0;
    for (let i = 0; i < va.length; i++) maxDiff = Math.max(maxDiff, Math.abs(va[i] - vb[i]));
    expect(maxDiff).toBeGreaterThan(1e-3); // m/s; float32 rounding of 100 m/s is 4e-6
    // The float64 curve is kept for float64 sums.
    expect(op.lastCurve.length).toBe(50);
    t.dispose();
  });

  it('stays correct when the op is called twice before the gradient is taken', () => {
    const kernel = createRvCurveKernel({ times, planets: 2 });
    const op = createRvCurveOp(kernel);
    const other = params.slice();
    other[0] = 15.1;
    const g = tf.tidy(() =>
      tf.grad((p: tf.Tensor) => {
        const first = op(p as tf.Tensor1D, params);
        op(tf.tensor1d(Float32Array.from(other)), other); // replaces the kernel's cache
        return tf.sum(first) as tf.Scalar;
      })(tf.tensor1d(Float32Array.from(params))).dataSync().slice(),
    );
    const ones = new Float64Array(N).fill(1);
    const ref = new Float64Array(10);
    kernel.vjp(params, ones, ref);
    for (let j = 0; j < 10; j++) expect(Math.abs(g[j] - ref[j])).toBeLessThan(1e-5 * (1 + Math.abs(ref[j])));
  });

  it('leaks no tensors over 1e4 gradient calls', () => {
    const op = createRvCurveOp(createRvCurveKernel({ times, planets: 2 }));
    const p = tf.tensor1d(Float32Array.from(params));
    const vg = tf.valueAndGrad((q: tf.Tensor) => tf.sum(tf.square(op(q as tf.Tensor1D, params))) as tf.Scalar);
    const step = () => tf.tidy(() => {
      const r = vg(p);
      return r.value.dataSync()[0] + r.grad.dataSync()[0];
    });
    step();
    const before = tf.memory().numTensors;
    for (let i = 0; i < 10000; i++) step();
    expect(tf.memory().numTensors).toBe(before);
    p.dispose();
  });
});

describe('RV log-likelihood TensorFlow.js op', () => {
  const values = Float64Array.from({ length: N }, (_, i) => 5 * Math.sin(0.3 * i));
  const errors = Float64Array.from({ length: N }, (_, i) => 1 + (i % 4));
  const instrument = Int32Array.from({ length: N }, (_, i) => i % 2);
  const lik = createRvLikelihood({ times, values, errors, instrument, instruments: 2, planets: 2, trendDegree: 1 });
  const full = Float64Array.from([...params, 1.5, -2, 0.8, 1.9, 0.01]);

  it('returns the float64 log-likelihood beside the tensor and its exact gradient', () => {
    const op = createRvLikelihoodOp(lik);
    const grad = tf.tidy(() => tf.grad((p: tf.Tensor) => op(p as tf.Tensor1D, full))(tf.tensor1d(Float32Array.from(full))).dataSync().slice());
    const ref = new Float64Array(lik.dim);
    const L = lik.logLikelihoodGrad(full, ref);
    expect(op.lastValue).toBe(L);
    for (let j = 0; j < lik.dim; j++) expect(grad[j]).toBe(Math.fround(ref[j]));
  });

  it('leaks no tensors over 1e4 gradient calls', () => {
    const op = createRvLikelihoodOp(lik);
    const p = tf.tensor1d(Float32Array.from(full));
    const vg = tf.valueAndGrad((q: tf.Tensor) => tf.mul(op(q as tf.Tensor1D, full), 2) as tf.Scalar);
    const step = () => tf.tidy(() => vg(p).grad.dataSync()[0]);
    step();
    const before = tf.memory().numTensors;
    for (let i = 0; i < 10000; i++) step();
    expect(tf.memory().numTensors).toBe(before);
    p.dispose();
  });
});

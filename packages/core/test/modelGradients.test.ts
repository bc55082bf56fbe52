import type { Tensor } from '@tensorflow/tfjs';
import { afterAll, describe, expect, it } from 'vitest';
import {
  checkTargetGradient,
  compileModel,
  float64Likelihood,
  priors,
  supports,
  tensorLikelihood,
  type CompiledModel,
  type ParameterDeclaration,
} from '../src/model/index.js';

/**
 * Gradients of compiled models against float64 central differences (common practice):
 * a model using every support, with the same likelihood written (a) as a fused float64
 * function with a hand-derived gradient and (b) with TensorFlow.js ops, on the CPU and
 * WASM backends. The TensorFlow.js path computes in float32, so its value and gradient
 * are compared with the float64 model at float32 accuracy.
 */

const N = 40;
const xs = Array.from({ length: N }, (_, i) => -1 + (2 * i) / (N - 1));
// Invented data: a smooth curve with a fixed pseudo-random wiggle.
const ys = xs.map((x, i) => 0.4 - 0.8 * x + 0.3 * Math.sin(x + 1) + 0.05 * Math.cos(37 * i));

const parameters: ParameterDeclaration[] = [
  { name: 'offset', prior: priors.normal(0, 5) },
  { name: 'slope', prior: priors.studentT(4, 0, 2) },
  { name: 'jitter', support: supports.positive(), prior: priors.halfNormal(1) },
  { name: 'amp', support: supports.unitInterval(), prior: priors.beta(1.5, 4) },
  { name: 'knots', size: 3, support: supports.ordered(), prior: priors.normal(0, 3) },
  { name: 'phase', support: supports.angle() },
  { name: 'weights', size: 3, support: supports.simplex(), prior: priors.dirichlet(2) },
  { name: 'scale', support: supports.lowerBounded(1), prior: priors.gamma(2, 1) },
  { name: 'tilt', support: supports.interval(-2, 3), prior: priors.truncatedNormal(0, 1, -2, 3) },
];

// μᵢ = offset + slope xᵢ + amp sin(xᵢ + phase) + Σₖ wₖ tₖ xᵢᵏ / scale + tilt xᵢ²
// log L = −½ Σ ((yᵢ − μᵢ)/jitter)² − N ln jitter
const fused = float64Likelihood((layout, data) => {
  const io = layout.offset('offset');
  const is = layout.offset('slope');
  const ij = layout.offset('jitter');
  const ia = layout.offset('amp');
  const ik = layout.offset('knots');
  const ip = layout.offset('phase');
  const iw = layout.offset('weights');
  const ic = layout.offset('scale');
  const it = layout.offset('tilt');
  const x = data.x as Float64Array;
  const y = data.y as Float64Array;
  return (t, g) => {
    const j = t[ij];
    const c = t[ic];
    let ll = -x.length * Math.log(j);
    let sumR2 = 0;
    for (let i = 0; i < x.length; i++) {
      const xi = x[i];
      let poly = 0;
      let pow = 1;
      for (let k = 0; k < 3; k++) {
        poly += t[iw + k] * t[ik + k] * pow;
        pow *= xi;
      }
      const s = Math.sin(xi + t[ip]);
      const mu = t[io] + t[is] * xi + t[ia] * s + poly / c + t[it] * xi * xi;
      const r = (y[i] - mu) / j;
      sumR2 += r * r;
      const q = r / j; // ∂ log L/∂μᵢ
      g[io] += q;
      g[is] += q * xi;
      g[ia] += q * s;
      g[ip] += q * t[ia] * Math.cos(xi + t[ip]);
      g[it] += q * xi * xi;
      g[ic] -= (q * poly) / (c * c);
      pow = 1;
      for (let k = 0; k < 3; k++) {
        g[iw + k] += (q * t[ik + k] * pow) / c;
        g[ik + k] += (q * t[iw + k] * pow) / c;
        pow *= xi;
      }
    }
    ll -= 0.5 * sumR2;
    g[ij] += sumR2 / j - x.length / j;
    return ll;
  };
});

const viaTensors = tensorLikelihood((p, _exact, { tf, data }) => {
  const x = data.x;
  const powers = [tf.onesLike(x), x, tf.square(x)];
  const w = tf.unstack(p.weights);
  const k = tf.unstack(p.knots);
  let poly: Tensor = tf.zerosLike(x);
  for (let i = 0; i < 3; i++) poly = tf.add(poly, tf.mul(tf.mul(w[i], k[i]), powers[i]));
  const mu = tf.addN([
    tf.add(p.offset, tf.mul(p.slope, x)),
    tf.mul(p.amp, tf.sin(tf.add(x, p.phase))),
    tf.div(poly, p.scale),
    tf.mul(p.tilt, tf.square(x)),
  ]);
  const r = tf.div(tf.sub(data.y, mu), p.jitter);
  return tf.sub(tf.mul(-0.5, tf.sum(tf.square(r))), tf.mul(x.size, tf.log(p.jitter)));
});

const values = { offset: 0.3, slope: -0.7, jitter: 0.2, amp: 0.35, knots: [-0.4, 0.1, 0.9], phase: 0.8, weights: [0.5, 0.3, 0.2], scale: 1.7, tilt: 0.25 };
const data = { x: xs, y: ys };

const models: CompiledModel[] = [];
afterAll(() => models.forEach((m) => m.dispose()));

describe('fused float64 model', () => {
  it('gradient matches central differences to 1e-7 at several positions', async () => {
    const model = await compileModel({ parameters, data, likelihood: fused });
    models.push(model);
    const x0 = model.unconstrain(values);
    for (const shift of [0, 0.3, -0.5]) {
      const x = x0.map((v, i) => v + shift * Math.sin(3 * i + 1));
      const check = checkTargetGradient(model, x);
      expect(check.maxError).toBeLessThan(1e-7);
      expect(check.analytic.every((g) => g !== 0)).toBe(true);
    }
  });
});

for (const backend of ['cpu', 'wasm'] as const) {
  describe(`TensorFlow.js model on the ${backend} backend`, () => {
    it('value and gradient agree with the float64 model to float32 accuracy', async () => {
      const reference = await compileModel({ parameters, data, likelihood: fused });
      const model = await compileModel({ parameters, data, likelihood: viaTensors }, { backend, quiet: true });
      models.push(model, reference);
      expect(model.backend).toBe(backend);
      const x0 = model.unconstrain(values);
      for (const shift of [0, 0.3, -0.5]) {
        const x = x0.map((v, i) => v + shift * Math.sin(3 * i + 1));
        const g = new Float64Array(model.dim);
        const value = model.logDensityGrad(x, g);
        // Float64 central differences of the float64 model (checked above).
        const numerical = checkTargetGradient(reference, x).numerical;
        const refValue = reference.logDensityGrad(x, new Float64Array(model.dim));
        // Float32 rounds each of the N terms at ~6e-8 relative: allow a few ulps for the
        // value (3e-6 relative) and 1e-5 of the largest gradient entry (errors seen: ~2e-7).
        expect(Math.abs(value - refValue)).toBeLessThan(3e-6 * Math.max(1, Math.abs(refValue)));
        const scale = Math.max(...numerical.map(Math.abs));
        for (let i = 0; i < model.dim; i++) {
          expect(Math.abs(g[i] - numerical[i])).toBeLessThan(1e-5 * Math.max(1, scale));
        }
      }
    });
  });
}

import type { Scalar, Tensor } from '@tensorflow/tfjs';
import { describe, expect, it, vi } from 'vitest';
import { compileModel, float64Likelihood, priors, supports, tensorLikelihood } from '../src/model/index.js';

/**
 * The float64 side channel and exact terms (DESIGN.md, numerics policy): a fused op
 * computes in float64 from the exact parameter values, and its float64 value replaces
 * its float32 value in the log-density. Facts checked: float32 spacing near 2.46e6 is
 * 0.25 and near 1e4 is ~1e-3 (IEEE 754 binary32, 24-bit significand; common practice),
 * so plain float32 arithmetic cannot reproduce the float64 values below.
 */

const N = 200;
// Invented data: times near a large epoch, as a BJD-like time series would have.
const epoch = 2_460_123.3;
const t = Array.from({ length: N }, (_, i) => epoch + 0.37 * i);
const y = t.map((ti, i) => 3 * Math.sin((2 * Math.PI * (ti - epoch)) / 7.3) + 0.1 * Math.cos(11 * i));

const parameters = [
  { name: 'reference', prior: priors.normal(epoch, 1) },
  { name: 'amp', support: supports.positive(), prior: priors.halfNormal(10) },
];
const period = 7.3;
const sigma = 0.01; // small noise: log L ≈ −1e4 scale, where float32 spacing is ~1e-3

/** Float64 log L and gradient in (reference, amp). */
function exactLogLik(ref: number, amp: number, g: Float64Array | null): number {
  let ll = 0;
  let gr = 0;
  let ga = 0;
  const w = (2 * Math.PI) / period;
  for (let i = 0; i < N; i++) {
    const ph = w * (t[i] - ref);
    const s = Math.sin(ph);
    const r = (y[i] - amp * s) / sigma;
    ll -= 0.5 * r * r;
    ga += (r / sigma) * s;
    gr += (r / sigma) * amp * Math.cos(ph) * -w;
  }
  if (g) {
    g[0] = gr;
    g[1] = ga;
  }
  return ll;
}

const reference = float64Likelihood((layout) => {
  const ir = layout.offset('reference');
  const ia = layout.offset('amp');
  const g = new Float64Array(2);
  return (th, grad) => {
    const v = exactLogLik(th[ir], th[ia], g);
    grad[ir] = g[0];
    grad[ia] = g[1];
    return v;
  };
});

const position = Float64Array.of(epoch + 0.0123456, Math.log(2.9));

describe('exact float64 terms in a TensorFlow.js likelihood', () => {
  it('a whole likelihood as one exact term reproduces the float64 log-density to 1e-12', async () => {
    const f64 = await compileModel({ parameters, likelihood: reference });
    const model = await compileModel(
      {
        parameters,
        likelihood: tensorLikelihood((p, exact, ctx) =>
          ctx.exactTerm([p.reference, p.amp], (grads) => {
            const g = new Float64Array(2);
            const v = exactLogLik(exact.reference as number, exact.amp as number, g);
            grads[0][0] = g[0];
            grads[1][0] = g[1];
            return v;
          }),
        ),
      },
      { backend: 'cpu', quiet: true },
    );
    const g64 = new Float64Array(2);
    const gtf = new Float64Array(2);
    const v64 = f64.logDensityGrad(position, g64);
    const vtf = model.logDensityGrad(position, gtf);
    expect(Math.abs(v64)).toBeGreaterThan(1e3);
    expect(Math.abs(vtf - v64)).toBeLessThan(1e-12 * Math.abs(v64));
    // Float32 alone could not: its spacing at |log L| ≈ 1e4 is ~1e-3.
    expect(Math.abs(Math.fround(v64) - v64)).toBeGreaterThan(1e-5);
    // Gradients pass through float32 once: relative accuracy ~6e-8 (common practice).
    for (let i = 0; i < 2; i++) expect(Math.abs(gtf[i] - g64[i])).toBeLessThan(1e-6 * Math.abs(g64[i]));
    model.dispose();
  });

  it('exact terms returned beside ordinary terms: the sum is float64 apart from the float32 terms', async () => {
    // Extra ordinary term: a small TensorFlow.js penalty −½ amp² (a few units at most).
    const penalty = (a: number): number => -0.5 * a * a;
    const f64 = await compileModel({
      parameters,
      likelihood: [
        reference,
        float64Likelihood((layout) => (th, g) => {
          g[layout.offset('amp')] = -th[layout.offset('amp')];
          return penalty(th[layout.offset('amp')]);
        }),
      ],
    });
    const model = await compileModel(
      {
        parameters,
        likelihood: tensorLikelihood((p, exact, ctx) => [
          ctx.exactTerm([p.reference, p.amp], (grads) => {
            const g = new Float64Array(2);
            const v = exactLogLik(exact.reference as number, exact.amp as number, g);
            grads[0][0] = g[0];
            grads[1][0] = g[1];
            return v;
          }),
          ctx.tf.mul(-0.5, ctx.tf.square(p.amp)) as Scalar,
        ]),
      },
      { backend: 'cpu', quiet: true },
    );
    const v64 = f64.logDensityGrad(position, new Float64Array(2));
    const vtf = model.logDensityGrad(position, new Float64Array(2));
    // Only the penalty (|value| < 10) is float32: error below 10 × 2⁻²³.
    expect(Math.abs(vtf - v64)).toBeLessThan(10 * 2 ** -23);
    model.dispose();
  });

  it('exact terms combined by tensor ops fall back to float32 values, with one warning', async () => {
    const writes: string[] = [];
    const spy = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
      writes.push(String(s));
      return true;
    });
    try {
      const model = await compileModel(
        {
          parameters,
          likelihood: tensorLikelihood((p, exact, ctx) =>
            ctx.tf.add(
              ctx.exactTerm([p.amp], (grads) => {
                const g = new Float64Array(2);
                const v = exactLogLik(exact.reference as number, exact.amp as number, g);
                grads[0][0] = g[1];
                return v;
              }),
              ctx.tf.scalar(0),
            ) as Scalar,
          ),
        },
        { backend: 'cpu' },
      );
      const v64 = exactLogLik(position[0], Math.exp(position[1]), null);
      const parts = model.logDensityParts(position);
      model.logDensityGrad(position, new Float64Array(2));
      // The float32 value: equal to v64 rounded to float32, not to v64 itself.
      expect(parts.logLikelihood).toBe(Math.fround(v64));
      expect(parts.logLikelihood).not.toBe(v64);
      expect(writes.filter((w) => w.includes('combined them with tensor ops')).length).toBe(1);
      model.dispose();
    } finally {
      spy.mockRestore();
    }
  });

  it('an op author’s own tf.customGrad op can register its float64 value with recordExact', async () => {
    const model = await compileModel(
      {
        parameters,
        likelihood: tensorLikelihood((p, exact, ctx) => {
          const { tf } = ctx;
          let value = NaN;
          const op = tf.customGrad((...args: unknown[]) => {
            const g = new Float64Array(2);
            value = exactLogLik(exact.reference as number, exact.amp as number, g);
            void args;
            return {
              value: tf.scalar(value),
              gradFunc: (dy: Tensor) => [tf.mul(dy, tf.scalar(g[0])), tf.mul(dy, tf.scalar(g[1]))],
            };
          }) as unknown as (a: Tensor, b: Tensor) => Scalar;
          const out = op(p.reference, p.amp);
          ctx.recordExact(out, value);
          return out;
        }),
      },
      { backend: 'cpu', quiet: true },
    );
    const v64 = exactLogLik(position[0], Math.exp(position[1]), null);
    expect(model.logDensityParts(position).logLikelihood).toBe(v64);
    model.dispose();
  });

  it('the side channel carries the exact value where the float32 tensor cannot', async () => {
    let seen: { tensor: number; exact: number } | undefined;
    const model = await compileModel(
      {
        parameters,
        likelihood: tensorLikelihood((p, exact, ctx) => {
          seen = { tensor: p.reference.dataSync()[0], exact: exact.reference as number };
          return ctx.tf.mul(0, p.amp) as Scalar;
        }),
      },
      { backend: 'cpu', quiet: true },
    );
    model.logDensityGrad(position, new Float64Array(2));
    expect(seen!.exact).toBe(position[0]);
    expect(seen!.tensor).toBe(Math.fround(position[0]));
    expect(Math.abs(seen!.tensor - position[0])).toBeGreaterThan(0.01); // 0.25-day float32 spacing
    model.dispose();
  });
});

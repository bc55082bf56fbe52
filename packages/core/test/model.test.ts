import { describe, expect, it } from 'vitest';
import { createRandomStream } from '../src/random/index.js';
import {
  compileModel,
  drawsByName,
  float64Likelihood,
  ModelDataError,
  ModelDeclarationError,
  ParameterValueError,
  priors,
  supports,
  SupportArgumentError,
  tensorLikelihood,
  type ParameterDeclaration,
} from '../src/model/index.js';

const declarations: ParameterDeclaration[] = [
  { name: 'offset', prior: priors.normal(0, 5) },
  { name: 'jitter', support: supports.positive(), prior: priors.halfNormal(1) },
  { name: 'knots', size: 3, support: supports.ordered(), prior: priors.normal(0, 3) },
  { name: 'phase', support: supports.angle() },
  { name: 'weights', size: 3, support: supports.simplex(), prior: priors.dirichlet(2) },
  { name: 'ecc', support: supports.unitInterval(), prior: priors.beta(1.5, 4) },
];

describe('compiled model: layout, names, outputs and helpers', () => {
  it('flattens parameters and names coordinates (0-based) and outputs', async () => {
    const model = await compileModel({
      parameters: declarations,
      derived: [
        { name: 'spread', compute: (v) => (v.knots as Float64Array)[2] - (v.knots as Float64Array)[0] },
        { name: 'doubled', size: 2, compute: (v) => [2 * (v.offset as number), 2 * (v.ecc as number)] },
      ],
    });
    // offset 1, jitter 1, knots 3, phase 2, weights 2 (simplex of 3), ecc 1.
    expect(model.dim).toBe(10);
    expect(model.names).toEqual([
      'offset', 'jitter.u', 'knots.u[0]', 'knots.u[1]', 'knots.u[2]', 'phase.u[0]', 'phase.u[1]', 'weights.u[0]', 'weights.u[1]', 'ecc.u',
    ]);
    expect(model.outputs.names).toEqual([
      'offset', 'jitter', 'knots[0]', 'knots[1]', 'knots[2]', 'phase', 'weights[0]', 'weights[1]', 'weights[2]', 'ecc',
      'spread', 'doubled[0]', 'doubled[1]',
    ]);
    expect(model.layout.offset('knots')).toBe(2);
    expect(model.layout.size('weights')).toBe(3);
    expect(model.backend).toBeNull();

    const values = { offset: -1.5, jitter: 0.3, knots: [-1, 0.5, 2], phase: 2.8, weights: [0.2, 0.5, 0.3], ecc: 0.15 };
    const x = model.unconstrain(values);
    const back = model.constrain(x);
    const close = (a: number, b: number): void => expect(Math.abs(a - b)).toBeLessThan(1e-12 * Math.max(1, Math.abs(b)));
    for (const [k, v] of Object.entries(values)) {
      if (typeof v === 'number') close(back[k] as number, v);
      else v.forEach((e, i) => close((back[k] as Float64Array)[i], e));
    }
    const out = new Float64Array(model.outputs.names.length);
    model.outputs.write(x, out);
    expect(Array.from(out.subarray(10))).toEqual([
      out[4] - out[2],
      2 * out[0],
      2 * out[9],
    ]);
    close(out[5], 2.8);
    const parts = model.logDensityParts(x);
    const g = new Float64Array(model.dim);
    expect(parts.total).toBe(model.logDensityGrad(x, g));
    expect(parts.logLikelihood).toBe(0);
  });

  it('draws from the prior inside each support and builds initial positions', async () => {
    const model = await compileModel({ parameters: declarations });
    const source = createRandomStream('model prior draws');
    for (let i = 0; i < 200; i++) {
      const v = model.samplePrior(source);
      expect(v.jitter as number).toBeGreaterThan(0);
      const k = v.knots as Float64Array;
      expect(k[0] < k[1] && k[1] < k[2]).toBe(true);
      const w = v.weights as Float64Array;
      expect(Math.abs(w[0] + w[1] + w[2] - 1)).toBeLessThan(1e-12);
      expect(Math.abs(v.phase as number)).toBeLessThanOrEqual(Math.PI);
      const x = model.unconstrain(v);
      expect(Number.isFinite(model.logDensityGrad(x, new Float64Array(model.dim)))).toBe(true);
    }
    const x0 = model.initialPosition(source, { offset: 4, jitter: 2 });
    const c = model.constrain(x0);
    expect(c.offset).toBe(4);
    expect(Math.abs((c.jitter as number) - 2)).toBeLessThan(1e-15);
  });

  it('a flat prior cannot be sampled, and says so naming the parameter', async () => {
    const model = await compileModel({ parameters: [{ name: 'level', prior: priors.flat() }] });
    expect(() => model.samplePrior(createRandomStream('x'))).toThrow(/values\.level.*flat\(\) cannot be sampled/);
  });
});

/**
 * A prior-only compiled model is a normalised density over the unconstrained
 * coordinates when every prior is proper: the Jacobian terms, the ln n! of ordered
 * vectors and the angle's radial density all integrate out (change of variables,
 * common practice). Checked by quadrature in the unconstrained space.
 */
describe('prior-only models integrate to one over the unconstrained space', () => {
  const integrate1d = (f: (u: number) => number, lo: number, hi: number, n = 20000): number => {
    const h = (hi - lo) / n;
    let s = 0;
    for (let i = 0; i < n; i++) s += f(lo + (i + 0.5) * h);
    return s * h;
  };
  const integrate2d = (f: (a: number, b: number) => number, lo: number, hi: number, lo2 = lo, hi2 = hi, n = 1200): number => {
    const h = (hi - lo) / n;
    const h2 = (hi2 - lo2) / n;
    let s = 0;
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) s += f(lo + (i + 0.5) * h, lo2 + (j + 0.5) * h2);
    return s * h * h2;
  };
  const oneD: [string, ParameterDeclaration, number, number][] = [
    ['positive with gamma(3, 2)', { name: 'p', support: supports.positive(), prior: priors.gamma(3, 2) }, -12, 6],
    ['interval(1, 4) with uniform', { name: 'p', support: supports.interval(1, 4) }, -40, 40],
    ['unit interval with beta(2, 5)', { name: 'p', support: supports.unitInterval(), prior: priors.beta(2, 5) }, -30, 20],
    ['lowerBounded(2) with truncatedNormal(3, 1, 2, ∞)', { name: 'p', support: supports.lowerBounded(2), prior: priors.truncatedNormal(3, 1, 2, Infinity) }, -15, 3],
    ['upperBounded(0) with a custom half-normal on (−∞, 0]', { name: 'p', support: supports.upperBounded(0), prior: priors.custom({ logDensity: (x) => Math.log(2) - 0.5 * x * x - 0.5 * Math.log(2 * Math.PI), upper: 0, derivative: (x) => -x }) }, -15, 4],
  ];
  for (const [label, decl, lo, hi] of oneD) {
    it(label, async () => {
      const model = await compileModel({ parameters: [decl] });
      const g = new Float64Array(1);
      const total = integrate1d((u) => Math.exp(model.logDensityGrad(Float64Array.of(u), g)), lo, hi);
      expect(Math.abs(total - 1)).toBeLessThan(1e-6);
    });
  }
  it('ordered vector of 2 with normal(0, 1) elements (ln 2! included)', async () => {
    const model = await compileModel({ parameters: [{ name: 'v', size: 2, support: supports.ordered(), prior: priors.normal(0, 1) }] });
    const g = new Float64Array(2);
    const total = integrate2d((a, b) => Math.exp(model.logDensityGrad(Float64Array.of(a, b), g)), -9, 9, -25, 4);
    expect(Math.abs(total - 1)).toBeLessThan(1e-5);
  });
  it('simplex of 3 with dirichlet([2, 3, 4])', async () => {
    const model = await compileModel({ parameters: [{ name: 'w', size: 3, support: supports.simplex(), prior: priors.dirichlet([2, 3, 4]) }] });
    const g = new Float64Array(2);
    const total = integrate2d((a, b) => Math.exp(model.logDensityGrad(Float64Array.of(a, b), g)), -14, 14);
    expect(Math.abs(total - 1)).toBeLessThan(1e-5);
  });
  it('angle with the circular uniform prior', async () => {
    const model = await compileModel({ parameters: [{ name: 'w', support: supports.angle() }] });
    const g = new Float64Array(2);
    const total = integrate2d((a, b) => Math.exp(model.logDensityGrad(Float64Array.of(a, b), g)), -6, 6);
    expect(Math.abs(total - 1)).toBeLessThan(1e-5);
  });
});

describe('drawsByName', () => {
  it('splits draws × columns blocks into chains per column', () => {
    const result = { outputs: { names: ['a', 'b[0]'], values: [Float64Array.of(1, 2, 3, 4), Float64Array.of(5, 6, 7, 8)] } };
    const named = drawsByName(result);
    expect(Object.keys(named)).toEqual(['a', 'b[0]']);
    expect(named.a.map((c) => Array.from(c))).toEqual([[1, 3], [5, 7]]);
    expect(named['b[0]'].map((c) => Array.from(c))).toEqual([[2, 4], [6, 8]]);
    expect(() => drawsByName({})).toThrow(/result\.outputs = undefined: expected recorded outputs/);
  });
});

describe('bad inputs give errors naming the field', () => {
  const base = [{ name: 'a', prior: priors.normal(0, 1) }];
  const ll = float64Likelihood((layout, data) => {
    const ia = layout.offset('a');
    const y = data.y as Float64Array;
    return (t, g) => {
      let s = 0;
      for (let i = 0; i < y.length; i++) {
        s += -0.5 * (y[i] - t[ia]) ** 2;
        g[ia] += y[i] - t[ia];
      }
      return s;
    };
  });
  it('NaN in data: field and row', async () => {
    const p = compileModel({ parameters: base, data: { t: [1, 2, 3], y: [0.1, NaN, 0.3] }, likelihood: ll });
    await expect(p).rejects.toThrow(ModelDataError);
    await expect(p).rejects.toThrow('y[1] = NaN: expected a finite number');
    await expect(compileModel({ parameters: base, data: { y: Float64Array.of(1, 2, Infinity) } })).rejects.toThrow('y[2] = Infinity');
    await expect(compileModel({ parameters: base, data: { y: 'abc' as unknown as number[] } })).rejects.toThrow(/^y = "abc": expected a finite number or an array/);
  });
  it('wrong lengths: names both fields', async () => {
    await expect(compileModel({ parameters: base, data: { t: [1, 2, 3], y: [1, 2] } })).rejects.toThrow("y.length = 2: expected 3, the length of data field 't'");
    // Explicit groups allow unrelated lengths, and are checked in turn.
    await expect(compileModel({ parameters: base, data: { t: [1, 2, 3], y: [1, 2, 3], u: [1] }, sameLength: [['t', 'y']] })).resolves.toBeDefined();
    await expect(compileModel({ parameters: base, data: { t: [1, 2, 3] }, sameLength: [['t', 'z']] })).rejects.toThrow(/sameLength\[0\] = "z"/);
  });
  it('lower >= upper', () => {
    expect(() => supports.interval(3, 3)).toThrow(SupportArgumentError);
    expect(() => supports.interval(3, 1)).toThrow('interval.upper = 1: expected a number greater than interval.lower = 3');
    expect(() => supports.interval(0, NaN)).toThrow('interval.upper = NaN: expected a finite number');
  });
  it('duplicate and malformed parameter names', async () => {
    await expect(compileModel({ parameters: [...base, { name: 'a', prior: priors.normal(0, 1) }] })).rejects.toThrow('parameters[1].name = "a": expected a name not already declared');
    await expect(compileModel({ parameters: [{ name: 'x[1]', prior: priors.normal(0, 1) }] })).rejects.toThrow(/parameters\[0\]\.name = "x\[1\]"/);
    await expect(compileModel({ parameters: [{ name: 'b', size: 0, prior: priors.normal(0, 1) }] })).rejects.toThrow(/parameters\.b\.size = 0/);
    await expect(compileModel({ parameters: base, derived: [{ name: 'a', compute: () => 1 }] })).rejects.toThrow('derived[0].name = "a"');
  });
  it('unknown parameter names: in values, in the layout, in likelihoods and derived quantities', async () => {
    const model = await compileModel({ parameters: base });
    expect(() => model.unconstrain({ a: 1, b: 2 })).toThrow(ParameterValueError);
    expect(() => model.unconstrain({ a: 1, b: 2 })).toThrow('values.b = 2: expected a declared parameter name: a');
    expect(() => model.unconstrain({})).toThrow('values.a = undefined: expected a value');
    expect(() => model.unconstrain({ a: [1, 2] })).toThrow('values.a = an array of length 2: expected a finite number');
    expect(() => model.layout.offset('slope')).toThrow('parameter name = "slope": expected one of the declared parameters: a');
    await expect(
      compileModel({ parameters: base, likelihood: float64Likelihood((layout) => { layout.offset('b'); return () => 0; }) }),
    ).rejects.toThrow(ModelDeclarationError);
    await expect(
      compileModel({ parameters: base, derived: [{ name: 'd', compute: (v) => (v.slope as number) * 2 }] }),
    ).rejects.toThrow('values.slope = undefined: expected one of the names values holds: a');
    await expect(
      compileModel({
        parameters: base,
        data: { y: [1, 2] },
        likelihood: tensorLikelihood((p, _e, { tf, data }) => tf.sum(tf.mul(p.slope, data.y))),
      }, { quiet: true, backend: 'cpu' }),
    ).rejects.toThrow('params.slope = undefined: expected one of the names params holds: a');
    await expect(
      compileModel({
        parameters: base,
        data: { y: [1, 2] },
        likelihood: tensorLikelihood((p, _e, { tf, data }) => tf.sum(tf.mul(p.a, data.why))),
      }, { quiet: true, backend: 'cpu' }),
    ).rejects.toThrow('context.data.why = undefined');
  });
  it('values outside the support, priors not covering the support, missing priors, typos', async () => {
    const model = await compileModel({ parameters: [{ name: 's', support: supports.positive(), prior: priors.exponential(1) }] });
    expect(() => model.unconstrain({ s: -1 })).toThrow('values.s = -1: expected a value inside support positive()');
    await expect(compileModel({ parameters: [{ name: 's', prior: priors.halfNormal(1) }] })).rejects.toThrow(/parameters\.s\.prior = "halfNormal\(1\)": expected a prior whose support \[0, Infinity\] covers/);
    await expect(compileModel({ parameters: [{ name: 's', support: supports.interval(0, 10), prior: priors.uniform(0, 5) }] })).rejects.toThrow(/parameters\.s\.prior = "uniform\(0, 5\)"/);
    await expect(compileModel({ parameters: [{ name: 'w', support: supports.angle(), prior: priors.normal(0, 1) }] })).rejects.toThrow(/a density on the circle/);
    await expect(compileModel({ parameters: [{ name: 'w', size: 3, support: supports.simplex(), prior: priors.normal(0, 1) }] })).rejects.toThrow(/priors\.dirichlet/);
    await expect(compileModel({ parameters: [{ name: 'w', size: 3, support: supports.simplex(), prior: priors.dirichlet([1, 2]) }] })).rejects.toThrow(/length 3/);
    await expect(compileModel({ parameters: [{ name: 'r' }] })).rejects.toThrow(/parameters\.r\.prior = undefined: expected a prior: support real\(\) has no proper default/);
    await expect(compileModel({ parameters: base, likelyhood: 1 } as never)).rejects.toThrow(/model\.likelyhood = 1: expected no such field/);
    await expect(compileModel({ parameters: base, likelihood: (() => 0) as never })).rejects.toThrow(/likelihood = a function: expected tensorLikelihood/);
  });
  it('a TensorFlow.js likelihood must return scalars', async () => {
    await expect(
      compileModel({ parameters: base, data: { y: [1, 2] }, likelihood: tensorLikelihood((p, _e, { tf, data }) => tf.mul(p.a, data.y) as never) }, { quiet: true, backend: 'cpu' }),
    ).rejects.toThrow(/likelihood = an object: expected a scalar \(rank 0\) tensor/);
  });
});

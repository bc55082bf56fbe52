import { describe, expect, it } from 'vitest';
import seedrandom from 'seedrandom';
import {
  OrbitParameterError,
  RvDataError,
  createRvCurveKernel,
  createRvLikelihood,
  type EccentricityForm,
  type RvLikelihoodOptions,
} from '../src/orbit/index.js';

/** Standard normal draws (Box-Muller) from a seeded stream. */
function normals(rng: () => number, n: number): Float64Array {
  const z = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const u = 1 - rng();
    z[i] = Math.sqrt(-2 * Math.log(u)) * Math.cos(2 * Math.PI * rng());
  }
  return z;
}

/**
 * Invented scenario: two planets, three instruments, a quadratic trend, 150 points over
 * about 1000 days, errors 1-4 m/s.
 */
function scenario(form: EccentricityForm, planetParams: number[]): { options: RvLikelihoodOptions; truth: Float64Array } {
  const rng = seedrandom('rv-likelihood-scenario');
  const N = 150;
  const times = new Float64Array(N);
  for (let i = 0; i < N; i++) times[i] = -500 + 1000 * rng();
  const instrument = Int32Array.from({ length: N }, (_, i) => (times[i] < -100 ? 0 : i % 3 === 0 ? 2 : 1));
  const errors = Float64Array.from({ length: N }, () => 1 + 3 * rng());
  const offsets = [-12.5, 3.1, 40.2];
  const jitters = [2.0, 0.7, 3.3];
  const trend = [0.004, -3e-6];
  const curve = createRvCurveKernel({ times, planets: planetParams.length / 5, eccentricityForm: form });
  const v = new Float64Array(N);
  curve.value(Float64Array.from(planetParams), v);
  const z = normals(rng, N);
  const values = new Float64Array(N);
  const t0 = 50;
  for (let i = 0; i < N; i++) {
    const j = instrument[i];
    const d = times[i] - t0;
    const sd = Math.sqrt(errors[i] ** 2 + jitters[j] ** 2);
    values[i] = v[i] + offsets[j] + trend[0] * d + trend[1] * d * d + sd * z[i];
  }
  const truth = Float64Array.from([...planetParams, ...offsets, ...jitters, ...trend]);
  return {
    options: { times, values, errors, instrument, instruments: 3, planets: planetParams.length / 5, eccentricityForm: form, trendDegree: 2, trendEpoch: t0 },
    truth,
  };
}

/** The Gaussian log-likelihood written out plainly, from the curve kernel's values. */
function naiveLogLikelihood(o: RvLikelihoodOptions, params: Float64Array): number {
  const np = o.planets;
  const curve = createRvCurveKernel({ times: o.times, planets: np, eccentricityForm: o.eccentricityForm });
  const v = new Float64Array(o.times.length);
  curve.value(params.subarray(0, 5 * np), v);
  const J = o.instruments;
  let L = 0;
  for (let i = 0; i < o.times.length; i++) {
    const j = o.instrument[i];
    const d = o.times[i] - (o.trendEpoch ?? 0);
    const mu = v[i] + params[5 * np + j] + params[5 * np + 2 * J] * d + params[5 * np + 2 * J + 1] * d * d;
    const s2 = o.errors[i] ** 2 + params[5 * np + J + j] ** 2;
    L += -0.5 * ((o.values[i] - mu) ** 2 / s2 + Math.log(2 * Math.PI * s2));
  }
  return L;
}

function derivative(f: (x: number) => number, x: number, h: number): number {
  return (-f(x + 2 * h) + 8 * f(x + h) - 8 * f(x - h) + f(x - 2 * h)) / (12 * h);
}

/** Step sizes per slot name (period relative, the rest absolute). */
function stepFor(name: string, value: number): number {
  if (name.startsWith('period')) return 1e-7 * value;
  if (name.startsWith('tc')) return 1e-5;
  if (name.startsWith('eccentricity')) return Math.min(1e-5, value / 4, (1 - value) / 4);
  if (name.startsWith('trendLinear')) return 1e-7;
  if (name.startsWith('trendQuadratic')) return 1e-10;
  return 1e-5;
}

function checkGradient(options: RvLikelihoodOptions, params: Float64Array, kinked: Set<string> = new Set()): void {
  const lik = createRvLikelihood(options);
  const grad = new Float64Array(lik.dim);
  const L = lik.logLikelihoodGrad(params, grad);
  expect(Math.abs(L - naiveLogLikelihood(options, params))).toBeLessThan(1e-9 * Math.abs(L));
  expect(Math.abs(lik.logLikelihood(params) - L)).toBeLessThan(1e-13 * Math.abs(L));
  for (let j = 0; j < lik.dim; j++) {
    const name = lik.names[j];
    const f = (x: number) => {
      const q = params.slice();
      q[j] = x;
      return lik.logLikelihood(q);
    };
    const h = stepFor(name, params[j]);
    const fd = kinked.has(name) ? 2 * derivative(f, params[j], h / 2) - derivative(f, params[j], h) : derivative(f, params[j], h);
    // Rounding of L (about 1e-13 |L|) over the step bounds what differences can resolve.
    const tol = 1e-6 * Math.abs(fd) + (1e-12 * Math.abs(L)) / h;
    expect(Math.abs(grad[j] - fd), `${name}: analytic ${grad[j]} vs differences ${fd}`).toBeLessThan(tol);
  }
}

describe('RV log-likelihood', () => {
  const planets = [12.3, 1.2, 0.3, 1.1, 35, 101.7, -20, 0.6, -2.5, 8];

  it('equals the plainly written Gaussian and its gradient matches differences (2 planets, 3 instruments, quadratic trend)', () => {
    const { options, truth } = scenario('polar', planets);
    checkGradient(options, truth);
    // Away from the truth too.
    const off = truth.slice();
    off[0] += 0.01;
    off[3] -= 0.2;
    off[12] += 1.5;
    checkGradient(options, off);
  });

  it('gradient is exact near e = 0 (1e-8) and at e = 0.95', () => {
    const { options, truth } = scenario('polar', [12.3, 1.2, 1e-8, -2, 35, 101.7, -20, 0.95, 2.5, 8]);
    checkGradient(options, truth);
  });

  it('root form: exact at e = 0 exactly (h = k = 0) and at e = 0.95', () => {
    const r = (e: number, w: number) => [Math.sqrt(e) * Math.cos(w), Math.sqrt(e) * Math.sin(w)];
    const { options, truth } = scenario('root', [12.3, 1.2, 0, 0, 35, 101.7, -20, ...r(0.95, 2.5), 8]);
    checkGradient(options, truth, new Set(['h[0]', 'k[0]']));
    const lik = createRvLikelihood(options);
    const g = new Float64Array(lik.dim);
    lik.logLikelihoodGrad(truth, g);
    expect(Math.abs(g[2]) + Math.abs(g[3])).toBe(0);
  });

  it('zero planets, no jitter: the offset gradient vanishes at the inverse-variance weighted mean', () => {
    // Analytic maximum-likelihood offset of a Gaussian with known variances (standard result).
    const rng = seedrandom('offset-only');
    const N = 40;
    const times = Float64Array.from({ length: N }, (_, i) => i);
    const errors = Float64Array.from({ length: N }, () => 0.5 + rng());
    const values = Float64Array.from({ length: N }, () => 10 + 3 * (rng() - 0.5));
    const instrument = new Int32Array(N);
    const lik = createRvLikelihood({ times, values, errors, instrument, instruments: 1, planets: 0 });
    let sw = 0;
    let swy = 0;
    for (let i = 0; i < N; i++) {
      sw += 1 / errors[i] ** 2;
      swy += values[i] / errors[i] ** 2;
    }
    const g = new Float64Array(2);
    lik.logLikelihoodGrad(Float64Array.of(swy / sw, 0), g);
    expect(Math.abs(g[0])).toBeLessThan(1e-10);
    expect(g[1]).toBe(0); // d/d jitter carries the factor jitter
    lik.logLikelihoodGrad(Float64Array.of(swy / sw + 1, 0), g);
    expect(g[0]).toBeCloseTo(-sw, 9); // d^2 log L / d offset^2 = -sum 1/sigma^2
  });

  it('returns -Infinity outside the support and names bad data by row and field', () => {
    const { options, truth } = scenario('polar', planets);
    const lik = createRvLikelihood(options);
    const g = new Float64Array(lik.dim).fill(7);
    const bad = truth.slice();
    bad[7] = 1.2; // eccentricity[1]
    expect(lik.logLikelihoodGrad(bad, g)).toBe(-Infinity);
    expect(g.every((x) => x === 0)).toBe(true);
    bad[7] = 0.5;
    bad[5] = -3; // period[1]
    expect(lik.logLikelihood(bad)).toBe(-Infinity);
    expect(lik.names.slice(10)).toEqual(['offset[0]', 'offset[1]', 'offset[2]', 'jitter[0]', 'jitter[1]', 'jitter[2]', 'trendLinear', 'trendQuadratic']);

    const errors = options.errors.slice();
    errors[17] = 0;
    expect(() => createRvLikelihood({ ...options, errors })).toThrow(RvDataError);
    expect(() => createRvLikelihood({ ...options, errors })).toThrow(/errors\[17\] = 0/);
    const instrument = options.instrument.slice();
    instrument[3] = 3;
    expect(() => createRvLikelihood({ ...options, instrument })).toThrow(/instrument\[3\] = 3: expected an index in 0..2/);
    const values = options.values.slice(0, 10);
    expect(() => createRvLikelihood({ ...options, values })).toThrow(/values.length/);
    expect(() => createRvLikelihood({ ...options, planets: -1 })).toThrow(OrbitParameterError);
    expect(() => lik.logLikelihood(new Float64Array(3))).toThrow(/params.length/);
  });
});

import { describe, expect, it } from 'vitest';
import { createLightCurveLikelihood } from '../src/transit/lightCurveLikelihood.js';
import { createLightCurveKernel } from '../src/transit/lightCurve.js';
import { LightCurveDataError, TransitWorkspaceError } from '../src/transit/errors.js';

/** Park–Miller minimal standard generator, seeded (Park & Miller 1988, CACM 31, 1192). */
function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
}

/** Box–Muller normal draws (Box & Muller 1958). */
function normals(n: number, seed: number): Float64Array {
  const u = lcg(seed);
  return Float64Array.from({ length: n }, () => Math.sqrt(-2 * Math.log(u())) * Math.cos(2 * Math.PI * u()));
}

// Invented scenario: a 2.7-day planet and a 6.1-day planet, 2-minute cadence over
// 12 days, 2-minute exposures, 600 ppm errors.
const N = 12 * 720;
const times = Float64Array.from({ length: N }, (_, i) => -6 + i / 720);
const truth = Float64Array.from([2.7, 0.3, 0.05, 1.0, 8.5, 0.35, 0.09, 6.1, -1.4, 0, 0, 15, 0.6, 0.05, 0.38, 0.22, 1.002, 0.0004, 0.15]);
const errors = Float64Array.from({ length: N }, (_, i) => 6e-4 * (1 + 0.2 * Math.sin(i)));

function simulated(): Float64Array {
  const kernel = createLightCurveKernel({ times, planets: 2, exposureTime: 2 / 1440, subSamples: 3 });
  const F = kernel.flux(truth.subarray(0, 16) as Float64Array);
  const noise = normals(N, 20240611);
  const D = truth[18];
  return Float64Array.from(F, (f, i) => (truth[16] * (f + D)) / (1 + D) + Math.sqrt(errors[i] ** 2 + truth[17] ** 2) * noise[i]);
}

describe('light-curve Gaussian log-likelihood', () => {
  const flux = simulated();
  const like = createLightCurveLikelihood({ times, flux, errors, planets: 2, exposureTime: 2 / 1440, subSamples: 3, dilution: true });

  it('lays out the parameters and equals the sum of Gaussian log densities', () => {
    expect(like.dim).toBe(19);
    expect(like.names.slice(16)).toEqual(['baseline', 'jitter', 'dilution']);
    const value = like.logLikelihood(truth);
    // Independent sum: log N(y | m, v) = -(y - m)²/(2v) - ln √(2 π v) for each point.
    const kernel = createLightCurveKernel({ times, planets: 2, exposureTime: 2 / 1440, subSamples: 3 });
    const F = kernel.flux(Float64Array.from(truth.subarray(0, 16)));
    let ref = 0;
    for (let i = 0; i < N; i++) {
      const m = (truth[16] * (F[i] + truth[18])) / (1 + truth[18]);
      const v = errors[i] ** 2 + truth[17] ** 2;
      ref += Math.log(Math.exp(-((flux[i] - m) ** 2) / (2 * v)) / Math.sqrt(2 * Math.PI * v));
    }
    expect(Math.abs(value - ref)).toBeLessThan(1e-8 * Math.abs(ref));
    expect(Math.abs(like.lastModel[0] - (truth[16] * (F[0] + truth[18])) / (1 + truth[18]))).toBeLessThan(1e-15);
  });

  it('has a gradient that matches central differences in every slot', () => {
    const at = Float64Array.from(truth);
    at[1] += 0.0007; // off the truth, so every component is clearly non-zero
    at[11] *= 1.01;
    at[17] = 0.0003;
    const grad = new Float64Array(like.dim);
    const value = like.logLikelihoodGrad(at, grad);
    expect(value).toBe(like.logLikelihood(at));
    for (let j = 0; j < like.dim; j++) {
      if (j === 9 || j === 10) continue; // e = 0 for planet 2: one-sided; omega irrelevant
      const h = 1e-6 * Math.max(1e-3, Math.abs(at[j]));
      const f = (d: number) => {
        const p = Float64Array.from(at);
        p[j] += d;
        return like.logLikelihood(p);
      };
      const fd = (f(-2 * h) - 8 * f(-h) + 8 * f(h) - f(2 * h)) / (12 * h);
      expect(Math.abs(grad[j] - fd), `${like.names[j]}: ${grad[j]} vs ${fd}`).toBeLessThan(2e-5 * Math.max(1, Math.abs(fd)));
    }
  });

  it('dilutes a transit depth δ to δ/(1 + D) (third light, common practice)', () => {
    const single = createLightCurveLikelihood({ times: Float64Array.from([0.3]), flux: Float64Array.from([1]), errors: Float64Array.from([1e-3]), planets: 1, dilution: true });
    const p = Float64Array.from([2.7, 0.3, 0, 0, 8.5, 0.1, 0.1, 0.3, 0.2, 1, 0, 0]);
    single.logLikelihood(p);
    const depth = 1 - single.lastModel[0];
    p[11] = 0.5;
    single.logLikelihood(p);
    expect(Math.abs((1 - single.lastModel[0]) - depth / 1.5)).toBeLessThan(1e-15);
  });

  it('sums ln(var) accurately for any scale of the data (counts, tiny or huge errors)', () => {
    const t = Float64Array.from({ length: 5000 }, (_, i) => -2 + i / 1250);
    for (const scale of [1e-70, 1e-6, 1, 1e6, 1e70]) {
      const y = Float64Array.from(t, (_, i) => scale * (1 + 1e-3 * Math.sin(i)));
      const err = Float64Array.from(t, (_, i) => scale * 1e-3 * (1 + 0.5 * Math.cos(i)));
      const l = createLightCurveLikelihood({ times: t, flux: y, errors: err, planets: 1 });
      const p = Float64Array.from([3, 0, 0, 0, 9, 0.2, 0.1, 0.3, 0.2, scale, 0]);
      const value = l.logLikelihood(p);
      let ref = 0;
      for (let i = 0; i < t.length; i++) {
        const v = err[i] * err[i];
        ref += -0.5 * ((y[i] - l.lastModel[i]) ** 2 / v + Math.log(2 * Math.PI * v));
      }
      expect(Math.abs(value - ref), `scale ${scale}`).toBeLessThan(1e-10 * Math.abs(ref));
    }
  });

  it('returns -Infinity with a zero gradient outside the support', () => {
    const grad = new Float64Array(like.dim).fill(7);
    const bad = Float64Array.from(truth);
    bad[18] = -0.1;
    expect(like.logLikelihoodGrad(bad, grad)).toBe(-Infinity);
    expect(grad.every((g) => g === 0)).toBe(true);
    bad[18] = 0.1;
    bad[2] = 1.3;
    expect(like.logLikelihood(bad)).toBe(-Infinity);
    bad[2] = 0.05;
    bad[16] = 0;
    expect(like.logLikelihood(bad)).toBe(-Infinity);
  });

  it('rejects malformed data, naming the row', () => {
    const t = Float64Array.from([0, 1, 2]);
    expect(() => createLightCurveLikelihood({ times: t, flux: Float64Array.from([1, 1, 1]), errors: Float64Array.from([1e-3, 0, 1e-3]), planets: 1 })).toThrow(/errors\[1\] = 0/);
    expect(() => createLightCurveLikelihood({ times: t, flux: Float64Array.from([1, Number.NaN, 1]), errors: Float64Array.from([1, 1, 1]), planets: 1 })).toThrow(LightCurveDataError);
    expect(() => createLightCurveLikelihood({ times: t, flux: Float64Array.from([1, 1]), errors: Float64Array.from([1, 1, 1]), planets: 1 })).toThrow(/flux.length/);
    const ok = createLightCurveLikelihood({ times: t, flux: Float64Array.from([1, 1, 1]), errors: Float64Array.from([1, 1, 1]), planets: 1 });
    expect(() => ok.logLikelihood(new Float64Array(3))).toThrow(TransitWorkspaceError);
  });
});

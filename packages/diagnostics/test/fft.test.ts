import { describe, expect, it } from 'vitest';
import { autocovariance, autocovarianceDirect, createFftPlan, fftInPlace, nextPowerOfTwo } from '../src/index.js';
import { autocovariancePair, createAutocovarianceWorkspace } from '../src/autocovariance.js';
import { createRandom, ar1Chain, normalDraws } from './support/random.js';
import { naiveDft } from './support/numeric.js';

describe('radix-2 FFT', () => {
  it('matches the O(n^2) definition of the DFT (independent method)', () => {
    const rng = createRandom(1);
    for (const n of [1, 2, 8, 64, 256]) {
      const re = normalDraws(rng, n);
      const im = normalDraws(rng, n);
      const expected = naiveDft(re, im);
      const r = Float64Array.from(re);
      const i = Float64Array.from(im);
      fftInPlace(createFftPlan(n), r, i);
      for (let k = 0; k < n; k++) {
        expect(Math.abs(r[k] - expected.re[k])).toBeLessThan(1e-11 * Math.sqrt(n));
        expect(Math.abs(i[k] - expected.im[k])).toBeLessThan(1e-11 * Math.sqrt(n));
      }
    }
  });

  it('inverse undoes forward, and Parseval holds: sum |x|^2 = (1/n) sum |X|^2 (Parseval theorem)', () => {
    const rng = createRandom(2);
    const n = 4096;
    const plan = createFftPlan(n);
    const re = normalDraws(rng, n);
    const im = normalDraws(rng, n);
    const r = Float64Array.from(re);
    const i = Float64Array.from(im);
    let energy = 0;
    for (let k = 0; k < n; k++) energy += re[k] ** 2 + im[k] ** 2;
    fftInPlace(plan, r, i);
    let spectral = 0;
    for (let k = 0; k < n; k++) spectral += r[k] ** 2 + i[k] ** 2;
    expect(spectral / n / energy).toBeCloseTo(1, 12);
    fftInPlace(plan, r, i, true);
    for (let k = 0; k < n; k++) {
      expect(Math.abs(r[k] - re[k])).toBeLessThan(1e-12);
      expect(Math.abs(i[k] - im[k])).toBeLessThan(1e-12);
    }
  });

  it('refuses sizes that are not powers of two', () => {
    expect(() => createFftPlan(12)).toThrow(/power of two/);
    expect(nextPowerOfTwo(1)).toBe(1);
    expect(nextPowerOfTwo(5)).toBe(8);
    expect(nextPowerOfTwo(1024)).toBe(1024);
  });
});

describe('autocovariance by FFT', () => {
  it('equals direct lag sums at every lag, odd and even lengths (independent method)', () => {
    const rng = createRandom(3);
    for (const n of [9, 100, 1001]) {
      const x = ar1Chain(rng, n, 0.7).map((v) => 5 + v);
      const viaFft = autocovariance(x);
      const direct = autocovarianceDirect(x, n - 1);
      for (let t = 0; t < n; t++) expect(Math.abs(viaFft[t] - direct[t])).toBeLessThan(1e-12);
    }
  });

  it('two series in one complex transform give the same as one at a time', () => {
    const rng = createRandom(4);
    const x = ar1Chain(rng, 777, 0.5);
    const y = ar1Chain(rng, 777, -0.4).map((v) => 100 * v);
    const ws = createAutocovarianceWorkspace(777);
    const ax = new Float64Array(777);
    const ay = new Float64Array(777);
    autocovariancePair(ws, x, y, ax, ay);
    const dx = autocovarianceDirect(x, 776);
    const dy = autocovarianceDirect(y, 776);
    for (let t = 0; t < 777; t++) {
      expect(Math.abs(ax[t] - dx[t])).toBeLessThan(1e-12);
      expect(Math.abs(ay[t] - dy[t])).toBeLessThan(1e-8);
    }
  });

  it('shorter padding n ≥ N + L returns exactly the first L + 1 lags (no wrap-around reaches them)', () => {
    const rng = createRandom(5);
    const n = 1000;
    const x = ar1Chain(rng, n, 0.9);
    const ws = createAutocovarianceWorkspace(n, 24); // size 1024: lags 0..24 exact
    expect(ws.plan.size).toBe(1024);
    const out = new Float64Array(n);
    const exact = autocovariancePair(ws, x, null, out, null);
    expect(exact).toBe(25);
    const direct = autocovarianceDirect(x, 24);
    for (let t = 0; t < exact; t++) expect(Math.abs(out[t] - direct[t])).toBeLessThan(1e-12);
  });
});

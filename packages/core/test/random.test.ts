import { describe, expect, it } from 'vitest';
import {
  chainSeedText,
  createChainStream,
  createRandomStream,
  createRunStreams,
  RandomStateError,
  restoreRandomStream,
} from '../src/random/index.js';
import { chiSquareUpperTail, erfc } from './support/mcse.js';

describe('random streams', () => {
  it('uniform draws lie in (0, 1) with 53-bit resolution and pass a chi-square test', () => {
    // Uniformity: chi-square goodness of fit with 100 equal bins (common practice),
    // at a fixed seed, rejecting only below p = 0.001.
    const rng = createRandomStream('uniform test');
    const n = 200_000;
    const bins = new Float64Array(100);
    let fractional = 0;
    let outside = 0;
    for (let i = 0; i < n; i++) {
      const u = rng.uniform();
      if (!(u > 0 && u < 1)) outside += 1;
      bins[Math.floor(u * 100)] += 1;
      // A float with fewer than ~32 random bits would have u·2^32 integral.
      if (u * 2 ** 32 !== Math.floor(u * 2 ** 32)) fractional += 1;
    }
    expect(outside).toBe(0);
    let chi = 0;
    for (const b of bins) chi += (b - n / 100) ** 2 / (n / 100);
    expect(chiSquareUpperTail(chi, 99)).toBeGreaterThan(0.001);
    // With 53 random bits, essentially every draw has bits below 2^-32.
    expect(fractional / n).toBeGreaterThan(0.999);
  });

  it('normal draws have mean 0, variance 1, skewness 0 and kurtosis 3 within 4 standard errors', () => {
    // Moments of N(0, 1) (common practice). Standard errors of the sample moments for
    // n iid draws are sqrt(Var(z^k) / n): Var z = 1, Var z² = 2, Var z³ = E z⁶ = 15,
    // Var z⁴ = E z⁸ − 9 = 96 (normal moments E z^(2m) = (2m − 1)!!, from memory).
    const rng = createRandomStream('normal test');
    const n = 200_000;
    let s1 = 0;
    let s2 = 0;
    let s3 = 0;
    let s4 = 0;
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      s1 += z;
      s2 += z * z;
      s3 += z * z * z;
      s4 += z * z * z * z;
    }
    expect(Math.abs(s1 / n)).toBeLessThan(4 * Math.sqrt(1 / n));
    expect(Math.abs(s2 / n - 1)).toBeLessThan(4 * Math.sqrt(2 / n));
    expect(Math.abs(s3 / n)).toBeLessThan(4 * Math.sqrt(15 / n));
    expect(Math.abs(s4 / n - 3)).toBeLessThan(4 * Math.sqrt(96 / n));
  });

  it('normal draws match the standard normal CDF in a chi-square test', () => {
    // Bins with equal N(0,1) probability via the normal quantile at k/20; the CDF from
    // erfc (Numerical Recipes' Chebyshev fit), independent of the polar method.
    const rng = createRandomStream('normal cdf test');
    const n = 100_000;
    const k = 20;
    const counts = new Float64Array(k);
    const cdf = (z: number): number => 0.5 * erfc(-z / Math.SQRT2);
    for (let i = 0; i < n; i++) {
      const p = cdf(rng.normal());
      counts[Math.min(k - 1, Math.floor(p * k))] += 1;
    }
    let chi = 0;
    for (const c of counts) chi += (c - n / k) ** 2 / (n / k);
    expect(chiSquareUpperTail(chi, k - 1)).toBeGreaterThan(0.001);
  });

  it('exponential draws have mean 1 and variance 1 within 4 standard errors', () => {
    // Exp(1): mean 1, variance 1; Var (x − 1)² = E(x − 1)⁴ − 1 = 9 − 1 = 8 (central moments of Exp(1), from memory).
    const rng = createRandomStream('exponential test');
    const n = 100_000;
    let s1 = 0;
    let s2 = 0;
    let nonPositive = 0;
    for (let i = 0; i < n; i++) {
      const x = rng.exponential();
      if (!(x > 0)) nonPositive += 1;
      s1 += x;
      s2 += (x - 1) ** 2;
    }
    expect(nonPositive).toBe(0);
    expect(Math.abs(s1 / n - 1)).toBeLessThan(4 * Math.sqrt(1 / n));
    expect(Math.abs(s2 / n - 1)).toBeLessThan(4 * Math.sqrt(8 / n));
  });

  it('a restored state continues the stream bit for bit, including a cached normal', () => {
    const rng = createRandomStream('restore test');
    for (let i = 0; i < 17; i++) rng.uniform();
    rng.normal(); // leaves the pair's second deviate cached
    const saved = JSON.parse(JSON.stringify(rng.getState()));
    expect(saved.spareNormal).not.toBeNull();
    const a = [rng.normal(), rng.uniform(), rng.normal(), rng.exponential()];
    const copy = restoreRandomStream(saved);
    const b = [copy.normal(), copy.uniform(), copy.normal(), copy.exponential()];
    expect(b).toEqual(a);
  });

  it('per-chain streams are reproducible and distinct', () => {
    const [a0, a1] = createRunStreams(42, 2);
    const b0 = createChainStream(42, 0);
    const c0 = createChainStream(43, 0);
    const xa0 = Array.from({ length: 5 }, () => a0.uniform());
    const xa1 = Array.from({ length: 5 }, () => a1.uniform());
    const xb0 = Array.from({ length: 5 }, () => b0.uniform());
    const xc0 = Array.from({ length: 5 }, () => c0.uniform());
    expect(xb0).toEqual(xa0);
    expect(xa1).not.toEqual(xa0);
    expect(xc0).not.toEqual(xa0);
    expect(chainSeedText(1, 23)).not.toBe(chainSeedText(12, 3));
  });

  it('streams of neighbouring chains are uncorrelated', () => {
    // Sample correlation of 20 000 paired normals has sd 1/sqrt(n); 4 sd tolerance.
    const [a, b] = createRunStreams(7, 2);
    const n = 20_000;
    let s = 0;
    for (let i = 0; i < n; i++) s += a.normal() * b.normal();
    expect(Math.abs(s / n)).toBeLessThan(4 / Math.sqrt(n));
  });

  it('rejects malformed states with a clear error', () => {
    expect(() => restoreRandomStream({ generator: 'xor4096', i: 0, w: 0, X: [1, 2], spareNormal: null })).toThrow(
      RandomStateError,
    );
    expect(() => createRunStreams(1.5, 2)).toThrow(/seed = 1.5/);
  });
});

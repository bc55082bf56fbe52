import { describe, expect, it } from 'vitest';
import { betaQuantile, logGamma, regularizedBeta } from '../src/index.js';
import { logBeta } from '../src/beta.js';
import { simpson } from './support/numeric.js';

describe('log-gamma (Lanczos)', () => {
  it('matches exact log-factorials and Gamma(1/2) = sqrt(pi)', () => {
    let logFactorial = 0;
    for (let n = 1; n <= 170; n++) {
      // Gamma(n + 1) = n!
      logFactorial += Math.log(n);
      expect(Math.abs(logGamma(n + 1) - logFactorial)).toBeLessThan(1e-13 * Math.max(1, logFactorial));
    }
    expect(logGamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    expect(logGamma(1)).toBeCloseTo(0, 14);
  });
});

describe('regularised incomplete beta', () => {
  it('agrees with the closed forms I_x(a,1) = x^a, I_x(1,b) = 1 - (1-x)^b, I_x(2,2) = 3x^2 - 2x^3 (calculus)', () => {
    for (const x of [1e-6, 0.01, 0.2, 0.5, 0.77, 0.999]) {
      expect(regularizedBeta(x, 3.7, 1)).toBeCloseTo(x ** 3.7, 13);
      expect(regularizedBeta(x, 1, 5.2)).toBeCloseTo(1 - (1 - x) ** 5.2, 13);
      expect(regularizedBeta(x, 2, 2)).toBeCloseTo(3 * x * x - 2 * x ** 3, 13);
    }
  });

  it('agrees with Simpson integration of the beta density for moderate and large parameters (independent method)', () => {
    for (const [a, b] of [
      [5, 3],
      [30.5, 70.2],
      [500.5, 1500.5],
    ]) {
      const lb = logBeta(a, b);
      const density = (t: number) => (t <= 0 || t >= 1 ? 0 : Math.exp((a - 1) * Math.log(t) + (b - 1) * Math.log1p(-t) - lb));
      const mean = a / (a + b);
      for (const x of [mean * 0.9, mean, mean * 1.05]) {
        const integral = simpson(density, 0, x, 200000);
        expect(Math.abs(regularizedBeta(x, a, b) - integral)).toBeLessThan(1e-9);
      }
    }
  });

  it('betaQuantile inverts it, including the large shape parameters of the quantile MCSE', () => {
    for (const [a, b] of [
      [2, 3],
      [0.9 * 4000 + 1, 0.1 * 4000 + 1],
      [0.05 * 2e5 + 1, 0.95 * 2e5 + 1],
    ]) {
      for (const p of [0.15865525393145707, 0.5, 0.8413447460685429, 0.999]) {
        const x = betaQuantile(p, a, b);
        expect(regularizedBeta(x, a, b)).toBeCloseTo(p, 11);
      }
    }
    expect(betaQuantile(0, 2, 3)).toBe(0);
    expect(betaQuantile(1, 2, 3)).toBe(1);
    expect(betaQuantile(0.5, -1, 3)).toBeNaN();
  });
});

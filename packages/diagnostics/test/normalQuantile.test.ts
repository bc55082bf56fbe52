import { describe, expect, it } from 'vitest';
import { normalQuantile } from '../src/index.js';
import { ONE_SIGMA_HIGH, ONE_SIGMA_LOW } from '../src/mcse.js';
import { normalCdf, normalUpperTail } from './support/numeric.js';

describe('inverse normal CDF (Wichura 1988, AS 241)', () => {
  it('inverts Phi computed independently by Simpson integration of the density, to 1e-12 relative', () => {
    for (const p of [0.5, 0.51, 0.3, 0.1, 0.075, 0.025, 0.01, 1e-3, 1e-6, 1e-10, 1e-15]) {
      const z = normalQuantile(p);
      const back = z < -1 ? normalUpperTail(-z) : normalCdf(z);
      expect(Math.abs(back - p) / p).toBeLessThan(1e-12);
      // symmetry Phi^{-1}(1 - p) = -Phi^{-1}(p); forming 1 - p rounds by ~1e-16, which moves z by
      // about 1e-16 / phi(z), so only check where that is below 1e-12
      if (p !== 0.5 && p >= 1e-3) expect(Math.abs(normalQuantile(1 - p) + z)).toBeLessThan(1e-12);
    }
  });

  it('gives the familiar percentage points (from memory: 1.959963984540054, 1.6448536269514722, 2.5758293035489004)', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 14);
    expect(normalQuantile(0.95)).toBeCloseTo(1.6448536269514722, 14);
    expect(normalQuantile(0.995)).toBeCloseTo(2.5758293035489004, 13);
  });

  it('handles the ends of [0, 1] and refuses anything else', () => {
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
    expect(normalQuantile(1.5)).toBeNaN();
    expect(normalQuantile(Number.NaN)).toBeNaN();
  });

  it('the one-sigma probabilities used by the quantile MCSE are Phi(-1) and Phi(1) (checked by integration)', () => {
    expect(ONE_SIGMA_LOW).toBeCloseTo(normalUpperTail(1), 13);
    expect(ONE_SIGMA_HIGH).toBeCloseTo(1 - normalUpperTail(1), 13);
  });
});

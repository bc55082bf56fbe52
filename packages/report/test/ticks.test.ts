import { describe, expect, it } from 'vitest';
import { niceNumber, niceTicks, tickLabels } from '../src/index.js';
import { axisTitle } from '../src/axes.js';

const isNice = (step: number) => {
  const f = step / 10 ** Math.floor(Math.log10(step) + 1e-12);
  return [1, 2, 5].some((n) => Math.abs(f - n) < 1e-9);
};

describe('niceNumber (Heckbert 1990, "Nice numbers for graph labels", Graphics Gems I)', () => {
  it('rounds to 1, 2, 5 or 10 times a power of ten', () => {
    // Heckbert's thresholds: round → <1.5: 1, <3: 2, <7: 5, else 10.
    expect(niceNumber(1.4, true)).toBe(1);
    expect(niceNumber(2.9, true)).toBe(2);
    expect(niceNumber(6.9, true)).toBe(5);
    expect(niceNumber(7.1, true)).toBe(10);
    expect(niceNumber(0.0029, true)).toBeCloseTo(0.002, 15);
    expect(niceNumber(0.0031, true)).toBeCloseTo(0.005, 15);
    // ceiling form: smallest nice number ≥ x
    expect(niceNumber(1.01, false)).toBe(2);
    expect(niceNumber(2.01, false)).toBe(5);
    expect(niceNumber(5.01, false)).toBe(10);
    expect(niceNumber(430, false)).toBe(500);
  });
  it('rejects non-positive input', () => {
    expect(() => niceNumber(0, true)).toThrow(RangeError);
  });
});

describe('niceTicks', () => {
  it('gives 0, 0.2, …, 1 for [0, 1] and 5 ticks (hand-worked from the algorithm)', () => {
    const t = niceTicks(0, 1, 5);
    expect(t.step).toBe(0.2);
    expect(t.values).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1]);
  });
  it('keeps ticks inside the domain, nicely spaced, for many ranges', () => {
    const ranges: [number, number][] = [
      [-57, 57],
      [3.2000005, 3.2000025],
      [0.9942, 1.0021],
      [2459000.1, 2459012.7],
      [-1e-9, 3e-9],
      [33, 49],
      [0, 400000],
    ];
    for (const [lo, hi] of ranges) {
      for (const target of [3, 5, 7]) {
        const t = niceTicks(lo, hi, target);
        expect(isNice(t.step)).toBe(true);
        expect(t.values.length).toBeGreaterThanOrEqual(2);
        expect(t.values.length).toBeLessThanOrEqual(2 * target + 1);
        for (const v of t.values) {
          expect(v).toBeGreaterThanOrEqual(lo - 1e-12 * Math.abs(lo));
          expect(v).toBeLessThanOrEqual(hi + 1e-12 * Math.abs(hi));
          // every tick is an integer multiple of the step
          expect(Math.abs(v / t.step - Math.round(v / t.step))).toBeLessThan(1e-6);
        }
      }
    }
  });
  it('avoids binary rounding noise in tick values', () => {
    expect(niceTicks(0, 0.7, 8).values).toContain(0.3);
  });
});

describe('tickLabels', () => {
  it('labels ordinary ticks in fixed point with the step’s decimals', () => {
    const t = niceTicks(0, 1, 5);
    expect(tickLabels(t.values, t.step).labels).toEqual(['0', '0.2', '0.4', '0.6', '0.8', '1.0']);
  });
  it('uses the minus sign U+2212 for negative ticks', () => {
    expect(tickLabels([-40, 0, 40], 20).labels).toEqual(['\u221240', '0', '40']);
  });
  it('takes out a round offset and a power of ten for a period known to 1e-6 d', () => {
    const t = niceTicks(3.2000005, 3.2000025, 5);
    const l = tickLabels(t.values, t.step);
    expect(l.offset).toBeCloseTo(3.2, 12);
    expect(l.exponent).toBe(-6);
    expect(l.labels).toEqual(['0.5', '1.0', '1.5', '2.0', '2.5']);
    // labels times the power of ten plus the offset give back the ticks
    l.labels.forEach((s, i) => expect(Number(s) * 1e-6 + l.offset).toBeCloseTo(t.values[i], 13));
    expect(axisTitle('period', 'd', l.offsetText, l.exponent)).toBe('period \u2212 3.2 [d] \u00d710\u207b\u2076');
  });
  it('takes the round offset 3.2 for ticks on both sides of it', () => {
    const t = niceTicks(3.199991, 3.200009, 5);
    const l = tickLabels(t.values, t.step);
    expect(l.offsetText).toBe('3.2');
    expect(l.exponent).toBe(-6);
    expect(l.labels).toContain('\u22125');
    expect(l.labels).toContain('0');
  });
  it('writes large times with an offset instead of seven digits', () => {
    for (const [lo, hi] of [
      [2459000.1, 2459000.9],
      [2459000.1, 2459012.7],
    ]) {
      const t = niceTicks(lo, hi, 5);
      const l = tickLabels(t.values, t.step);
      expect(l.offset).toBe(2459000);
      expect(new Set(l.labels).size).toBe(l.labels.length);
      l.labels.forEach((s, i) => expect(Number(s) * 10 ** l.exponent + l.offset).toBeCloseTo(t.values[i], 6));
    }
  });
});

import { describe, expect, it } from 'vitest';
import { evenIndices, minMaxDownsample } from '../src/index.js';
import { normalStream } from './synthetic.js';

describe('minMaxDownsample', () => {
  const normal = normalStream(7);
  const n = 100_000;
  const values = Float64Array.from({ length: n }, () => normal());
  values[31_337] = 25; // a one-draw spike
  values[77_001] = -19;

  it('bounds the number of points', () => {
    for (const max of [4, 99, 600, 1000]) {
      const d = minMaxDownsample(values, max);
      expect(d.index.length).toBeLessThanOrEqual(max);
      expect(d.index.length).toBeGreaterThanOrEqual(Math.floor(max / 2));
    }
  });
  it('keeps the global extremes and a single-draw spike exactly', () => {
    const d = minMaxDownsample(values, 600);
    expect(Math.max(...d.value)).toBe(25);
    expect(Math.min(...d.value)).toBe(-19);
    expect(Array.from(d.index)).toContain(31_337);
    expect(Array.from(d.index)).toContain(77_001);
  });
  it('keeps every bin’s min and max, in draw order', () => {
    const d = minMaxDownsample(values, 200);
    const bins = 100;
    for (let b = 0; b < bins; b++) {
      const lo = Math.floor((b * n) / bins);
      const hi = Math.floor(((b + 1) * n) / bins);
      let mn = Infinity;
      let mx = -Infinity;
      for (let i = lo; i < hi; i++) {
        mn = Math.min(mn, values[i]);
        mx = Math.max(mx, values[i]);
      }
      const kept = Array.from(d.index).filter((i) => i >= lo && i < hi).map((i) => values[i]);
      expect(kept).toContain(mn);
      expect(kept).toContain(mx);
    }
    for (let i = 1; i < d.index.length; i++) expect(d.index[i]).toBeGreaterThan(d.index[i - 1]);
  });
  it('returns short series whole', () => {
    const d = minMaxDownsample([3, 1, 2], 10);
    expect(Array.from(d.index)).toEqual([0, 1, 2]);
    expect(Array.from(d.value)).toEqual([3, 1, 2]);
  });
});

describe('evenIndices', () => {
  it('spans first to last without repeats', () => {
    const k = evenIndices(1000, 7);
    expect(k).toEqual([0, 167, 333, 500, 666, 833, 999]);
    expect(evenIndices(5, 10)).toEqual([0, 1, 2, 3, 4]);
  });
});

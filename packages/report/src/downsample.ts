/**
 * Bounded-size polylines for long chains. The draws are cut into equal bins of
 * consecutive indices and each bin keeps its smallest and largest value, in the
 * order they occur (common practice for plotting long time series; a single
 * spike of one draw stays visible, and the global minimum and maximum are kept
 * exactly).
 */

export interface Downsampled {
  /** Indices of the kept draws, increasing. */
  index: Float64Array;
  /** Their values. */
  value: Float64Array;
}

/**
 * At most `maxPoints` (≥ 2) points of `values[start..end)` keeping each bin's
 * extremes. Series that are short enough come back whole.
 */
export function minMaxDownsample(
  values: ArrayLike<number>,
  maxPoints: number,
  start = 0,
  end = values.length,
): Downsampled {
  if (!(maxPoints >= 2)) throw new RangeError(`minMaxDownsample: maxPoints must be at least 2, got ${maxPoints}`);
  const n = end - start;
  if (n <= maxPoints) {
    const index = new Float64Array(n);
    const value = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      index[i] = start + i;
      value[i] = values[start + i];
    }
    return { index, value };
  }
  const bins = Math.floor(maxPoints / 2);
  const index: number[] = [];
  for (let b = 0; b < bins; b++) {
    const lo = start + Math.floor((b * n) / bins);
    const hi = start + Math.floor(((b + 1) * n) / bins);
    let iMin = lo;
    let iMax = lo;
    for (let i = lo + 1; i < hi; i++) {
      if (values[i] < values[iMin]) iMin = i;
      if (values[i] > values[iMax]) iMax = i;
    }
    if (iMin === iMax) index.push(iMin);
    else if (iMin < iMax) index.push(iMin, iMax);
    else index.push(iMax, iMin);
  }
  const value = new Float64Array(index.length);
  for (let i = 0; i < index.length; i++) value[i] = values[index[i]];
  return { index: Float64Array.from(index), value };
}

/**
 * Evenly spaced indices 0..n-1, at most `maxCount` of them (all of them if
 * n ≤ maxCount), for thinning scatter points and model draws.
 */
export function evenIndices(n: number, maxCount: number): number[] {
  if (n <= maxCount) return Array.from({ length: n }, (_, i) => i);
  if (maxCount <= 0) return [];
  if (maxCount === 1) return [0];
  const out: number[] = [];
  for (let k = 0; k < maxCount; k++) out.push(Math.round((k * (n - 1)) / (maxCount - 1)));
  return out;
}

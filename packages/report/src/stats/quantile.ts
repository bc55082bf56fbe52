/**
 * Sample quantile by linear interpolation between order statistics: definition 7
 * of Hyndman & Fan (1996, The American Statistician 50, 361), the default of many
 * statistics environments. `sorted` must be increasing.
 */
export function quantileSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return Number.NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(n - 1, lo + 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}

/** Mean and sample standard deviation (n − 1 denominator). */
export function meanAndSd(values: ArrayLike<number>): { mean: number; sd: number } {
  const n = values.length;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += values[i];
  mean /= n;
  let ss = 0;
  for (let i = 0; i < n; i++) ss += (values[i] - mean) ** 2;
  return { mean, sd: n > 1 ? Math.sqrt(ss / (n - 1)) : 0 };
}

/** Pearson correlation of two equally long samples; NaN when either is constant. */
export function correlation(x: ArrayLike<number>, y: ArrayLike<number>): number {
  const a = meanAndSd(x);
  const b = meanAndSd(y);
  const n = x.length;
  if (!(a.sd > 0 && b.sd > 0) || n < 2) return Number.NaN;
  let s = 0;
  for (let i = 0; i < n; i++) s += (x[i] - a.mean) * (y[i] - b.mean);
  return s / (n - 1) / (a.sd * b.sd);
}

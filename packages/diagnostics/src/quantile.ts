/**
 * Sample quantile of sorted draws by linear interpolation between order statistics
 * (Hyndman & Fan 1996, The American Statistician 50, 361: their definition 7):
 * h = (S - 1) p, value = x_(floor h) + (h - floor h)(x_(floor h + 1) - x_(floor h)).
 * @param sorted draws sorted ascending
 * @param p probability in [0, 1]
 */
export function quantileOfSorted(sorted: ArrayLike<number>, p: number): number {
  const n = sorted.length;
  if (n === 0) return NaN;
  const h = (n - 1) * p;
  const lo = Math.floor(h);
  if (lo >= n - 1) return sorted[n - 1];
  if (lo < 0) return sorted[0];
  const frac = h - lo;
  return frac === 0 ? sorted[lo] : sorted[lo] + frac * (sorted[lo + 1] - sorted[lo]);
}

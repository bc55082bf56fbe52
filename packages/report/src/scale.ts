/** Linear maps from data units to SVG pixels, and data extents. */

export type Domain = readonly [number, number];

/** A linear map taking domain[0] → range[0] and domain[1] → range[1]. */
export function linearScale(domain: Domain, range: Domain): (value: number) => number {
  const [d0, d1] = domain;
  const [r0, r1] = range;
  const k = (r1 - r0) / (d1 - d0);
  return (value: number) => r0 + (value - d0) * k;
}

/** Smallest and largest finite value over several arrays, or undefined if none. */
export function extent(arrays: readonly ArrayLike<number>[]): Domain | undefined {
  let lo = Infinity;
  let hi = -Infinity;
  for (const a of arrays) {
    for (let i = 0; i < a.length; i++) {
      const v = a[i];
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return lo <= hi ? [lo, hi] : undefined;
}

/**
 * The extent widened by `fraction` of its width on each side. A zero-width extent
 * (a constant quantity) is widened by 1e-3 of its magnitude, or by 1 at zero, so
 * that axes and ticks still exist.
 */
export function padDomain(domain: Domain | undefined, fraction = 0.04): Domain {
  if (domain === undefined) return [0, 1];
  const [lo, hi] = domain;
  const width = hi - lo;
  if (!(width > Math.abs(hi) * 1e-13)) {
    const half = lo === 0 ? 1 : Math.abs(lo) * 1e-3;
    return [lo - half, hi + half];
  }
  return [lo - width * fraction, hi + width * fraction];
}

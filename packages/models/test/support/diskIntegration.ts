/**
 * Independent numerical integration of a quadratically limb-darkened stellar disk
 * behind an opaque planet, for checking the analytic flux. Nothing here shares code
 * or formulas with `src/transit`: only the geometry of two circles and the intensity
 * law I(μ)/I(1) = 1 - u1(1 - μ) - u2(1 - μ)², μ = √(1 - r²), are used.
 *
 * Two methods:
 *  - `fluxByAnnuli`: the star is cut into annuli of radius r; the planet hides the
 *    arc 2α(r) of each, with cos α = (r² + z² - k²)/(2 r z) (exact geometry), so the
 *    hidden light is ∫_0^1 I(r) 2 r α(r) dr, a 1-D integral.
 *  - `fluxByPlanetPolar`: a genuine 2-D integral in polar coordinates (ρ, φ) centred
 *    on the planet, ∫ dφ ∫ I(r(ρ, φ)) ρ dρ over the part of the planet's disk inside
 *    the star.
 * Both split the range at every kink of the integrand (contact radii and angles) and
 * map each piece with x = (1 - cos θ)/2, which turns the square-root endpoint
 * behaviour (limb, contact points) into smooth functions of θ, then apply
 * Gauss–Legendre quadrature (nodes by Newton's method on the Legendre recurrence;
 * e.g. Press et al., Numerical Recipes, 3rd ed., 2007, §4.6).
 */

const nodeCache = new Map<number, { x: Float64Array; w: Float64Array }>();

/** Gauss–Legendre nodes and weights on [-1, 1]. */
export function gaussLegendre(n: number): { x: Float64Array; w: Float64Array } {
  const cached = nodeCache.get(n);
  if (cached) return cached;
  const x = new Float64Array(n);
  const w = new Float64Array(n);
  for (let i = 0; i < Math.ceil(n / 2); i++) {
    let t = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5));
    let dp = 0;
    for (let iter = 0; iter < 100; iter++) {
      let p0 = 1;
      let p1 = t;
      for (let j = 2; j <= n; j++) {
        const p2 = ((2 * j - 1) * t * p1 - (j - 1) * p0) / j;
        p0 = p1;
        p1 = p2;
      }
      dp = (n * (t * p1 - p0)) / (t * t - 1);
      const step = p1 / dp;
      t -= step;
      if (Math.abs(step) < 1e-16) break;
    }
    // Recompute the derivative at the converged node.
    let p0 = 1;
    let p1 = t;
    for (let j = 2; j <= n; j++) {
      const p2 = ((2 * j - 1) * t * p1 - (j - 1) * p0) / j;
      p0 = p1;
      p1 = p2;
    }
    dp = (n * (t * p1 - p0)) / (t * t - 1);
    x[i] = -t;
    x[n - 1 - i] = t;
    w[i] = 2 / ((1 - t * t) * dp * dp);
    w[n - 1 - i] = w[i];
  }
  const rule = { x, w };
  nodeCache.set(n, rule);
  return rule;
}

/**
 * ∫_a^b f(x) dx with the map x = a + (b - a)(1 - cos θ)/2, θ in [0, π], and an
 * n-point Gauss–Legendre rule in θ (exact-geometry endpoints with square-root
 * behaviour become smooth).
 */
export function integrateWithEndpointMap(f: (x: number) => number, a: number, b: number, n: number): number {
  if (!(b > a)) return 0;
  const { x, w } = gaussLegendre(n);
  const half = (b - a) / 2;
  let sum = 0;
  for (let i = 0; i < n; i++) {
    const theta = (Math.PI / 2) * (x[i] + 1);
    const u = a + half * (1 - Math.cos(theta));
    sum += w[i] * f(u) * half * Math.sin(theta);
  }
  return sum * (Math.PI / 2);
}

function intensity(r: number, u1: number, u2: number): number {
  const mu = Math.sqrt(Math.max(0, 1 - r * r));
  return 1 - u1 * (1 - mu) - u2 * (1 - mu) * (1 - mu);
}

/** Unocculted flux of the disk, ∫_0^1 I(r) 2π r dr, numerically. */
export function totalDiskFlux(u1: number, u2: number, n = 200): number {
  return integrateWithEndpointMap((r) => intensity(r, u1, u2) * 2 * Math.PI * r, 0, 1, n);
}

function sortedBreaks(points: number[], lo: number, hi: number): number[] {
  const inside = points.filter((p) => p > lo && p < hi);
  return [lo, ...Array.from(new Set(inside)).sort((a, b) => a - b), hi];
}

/**
 * Relative flux by integrating, over stellar radius, the light of each annulus hidden
 * by the planet (1-D, exact geometry). z, k in stellar radii.
 */
export function fluxByAnnuli(z: number, k: number, u1: number, u2: number, n = 200): number {
  const hiddenHalfAngle = (r: number): number => {
    if (r === 0) return z < k ? Math.PI : z === k ? Math.PI / 2 : 0;
    if (z === 0) return r < k ? Math.PI : 0;
    const c = (r * r + z * z - k * k) / (2 * r * z);
    if (c <= -1) return Math.PI;
    if (c >= 1) return 0;
    return Math.acos(c);
  };
  const breaks = sortedBreaks([Math.abs(z - k), z + k], 0, 1);
  let hidden = 0;
  for (let i = 0; i + 1 < breaks.length; i++) {
    hidden += integrateWithEndpointMap((r) => intensity(r, u1, u2) * 2 * r * hiddenHalfAngle(r), breaks[i], breaks[i + 1], n);
  }
  return 1 - hidden / totalDiskFlux(u1, u2, n);
}

/**
 * Relative flux by a 2-D integral in polar coordinates centred on the planet. For each
 * position angle φ the ray from the planet's centre is inside the star for
 * ρ in [ρ-, ρ+], ρ± = -z cos φ ± √(1 - z² sin² φ); the hidden light along it is
 * ∫ I ρ dρ over [max(0, ρ-), min(k, ρ+)]. The φ range is split where ρ± = k (the
 * limb intersections) and where the ray grazes the limb.
 */
export function fluxByPlanetPolar(z: number, k: number, u1: number, u2: number, nAngle = 96, nRadius = 64): number {
  const alongRay = (phi: number): number => {
    const c = Math.cos(phi);
    const s = Math.sin(phi);
    const disc = 1 - z * z * s * s;
    if (disc <= 0) return 0;
    const root = Math.sqrt(disc);
    const lo = Math.max(0, -z * c - root);
    const hi = Math.min(k, -z * c + root);
    if (!(hi > lo)) return 0;
    return integrateWithEndpointMap(
      (rho) => {
        const r2 = z * z + rho * rho + 2 * z * rho * c;
        return intensity(Math.sqrt(Math.max(0, r2)), u1, u2) * rho;
      },
      lo,
      hi,
      nRadius,
    );
  };
  const breaks: number[] = [];
  if (z > 0) {
    const c = (1 - z * z - k * k) / (2 * z * k);
    if (c > -1 && c < 1) breaks.push(Math.acos(c));
    if (z > 1) breaks.push(Math.PI - Math.asin(1 / z));
  }
  const edges = sortedBreaks(breaks, 0, Math.PI);
  let hidden = 0;
  for (let i = 0; i + 1 < edges.length; i++) hidden += integrateWithEndpointMap(alongRay, edges[i], edges[i + 1], nAngle);
  return 1 - (2 * hidden) / totalDiskFlux(u1, u2, 200);
}

/** Area of overlap of the unit disk and a disk of radius k at distance z (geometry). */
export function overlapArea(z: number, k: number): number {
  if (z >= 1 + k) return 0;
  if (z <= Math.abs(1 - k)) return Math.PI * Math.min(1, k) ** 2;
  const k0 = Math.acos((k * k + z * z - 1) / (2 * k * z));
  const k1 = Math.acos((1 - k * k + z * z) / (2 * z));
  return k * k * k0 + k1 - 0.5 * Math.sqrt(Math.max(0, 4 * z * z - (1 + z * z - k * k) ** 2));
}

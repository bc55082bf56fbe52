import { describe, expect, it } from 'vitest';
import {
  OrbitParameterError,
  RvDataError,
  conjunctionMeanAnomaly,
  createRvCurveKernel,
  separationOverA,
  solveKepler,
  trueAnomalyFromEccentric,
  type EccentricityForm,
} from '../src/orbit/index.js';

const TWO_PI = 2 * Math.PI;

/** Independent route to the velocity: Kepler solve, atan2 half-angle true anomaly, Winn's formula. */
function velocityDirect(t: number, P: number, tc: number, e: number, w: number, K: number): number {
  const M = (TWO_PI * (t - tc)) / P + conjunctionMeanAnomaly(e, w);
  const f = trueAnomalyFromEccentric(solveKepler(M, e), e);
  return K * (Math.cos(f + w) + e * Math.cos(w));
}

/**
 * Line-of-sight coordinate of the planet, Z / (a sin i) = (r/a) sin(omega + f)
 * (Winn 2010, "Transits and Occultations", eq. 2; +Z towards the observer).
 */
function skyZ(t: number, P: number, tc: number, e: number, w: number): number {
  const M = (TWO_PI * (t - tc)) / P + conjunctionMeanAnomaly(e, w);
  const E = solveKepler(M, e);
  return separationOverA(E, e) * Math.sin(w + trueAnomalyFromEccentric(E, e));
}

/** Fourth-order central difference of a scalar function. */
function derivative(f: (x: number) => number, x: number, h: number): number {
  return (-f(x + 2 * h) + 8 * f(x + h) - 8 * f(x - h) + f(x - 2 * h)) / (12 * h);
}

function makeTimes(n: number, span: number, seed = 1): Float64Array {
  const t = new Float64Array(n);
  for (let i = 0; i < n; i++) t[i] = -span / 2 + (span * i) / n + 2.3 * Math.sin(seed * 7.1 * (i + 1));
  return t;
}

describe('RV curve kernel values', () => {
  it('matches the direct Kepler + true-anomaly route, summed over planets', () => {
    const times = makeTimes(300, 800);
    const planets = [
      [12.3, 1.2, 0.3, 1.1, 35],
      [101.7, -20, 0.95, -1.5, 8],
      [3.05, 0.4, 0, 0.7, 4],
    ];
    const k = createRvCurveKernel({ times, planets: 3 });
    const out = new Float64Array(times.length);
    expect(k.value(Float64Array.from(planets.flat()), out)).toBe(true);
    for (let i = 0; i < times.length; i++) {
      let v = 0;
      for (const [P, tc, e, w, K] of planets) v += velocityDirect(times[i], P, tc, e, w, K);
      expect(Math.abs(out[i] - v)).toBeLessThan(1e-10);
    }
  });

  it('is the time derivative of the line-of-sight position: v = K sqrt(1 - e^2)/n d(Z/(a sin i))/dt', () => {
    // Winn (2010), eqs. 2-4: Z = r sin(omega + f) sin i and v_star proportional to dZ_planet/dt
    // with dZ/dt = a n sin i [cos(omega + f) + e cos omega] / sqrt(1 - e^2). The fourth-order
    // difference in time is an independent check of the sign and phase convention.
    for (const [e, w] of [
      [0, 0.4],
      [0.3, 2.2],
      [0.8, -1.0],
    ]) {
      const P = 7.5;
      const tc = 0.9;
      const K = 20;
      const times = Float64Array.from({ length: 40 }, (_, i) => -10 + 0.51 * i);
      const k = createRvCurveKernel({ times, planets: 1 });
      const out = new Float64Array(times.length);
      k.value(Float64Array.of(P, tc, e, w, K), out);
      const n = TWO_PI / P;
      for (let i = 0; i < times.length; i++) {
        const dZ = derivative((t) => skyZ(t, P, tc, e, w), times[i], 1e-3);
        expect(Math.abs(out[i] - (K * Math.sqrt(1 - e * e) * dZ) / n)).toBeLessThan(1e-7 * K);
      }
    }
  });

  it('a circular orbit has zero velocity at conjunction with a negative slope, the planet in front', () => {
    // Geometry check (common practice): after mid-transit the planet moves away from
    // the observer, so the star approaches (v < 0).
    const P = 4.2;
    const tc = 1.7;
    const times = Float64Array.of(tc - 1e-3, tc, tc + 1e-3);
    const k = createRvCurveKernel({ times, planets: 1 });
    const out = new Float64Array(3);
    k.value(Float64Array.of(P, tc, 0, 0.9, 50), out);
    expect(Math.abs(out[1])).toBeLessThan(1e-12);
    expect(out[0]).toBeGreaterThan(0);
    expect(out[2]).toBeLessThan(0);
    expect(skyZ(tc, P, tc, 0, 0.9)).toBeCloseTo(1, 14);
    // Eccentric orbit: v(tc) = K e cos omega, since cos(f_c + omega) = 0.
    k.value(Float64Array.of(P, tc, 0.4, 0.9, 50), out);
    expect(Math.abs(out[1] - 50 * 0.4 * Math.cos(0.9))).toBeLessThan(1e-12);
  });

  it('is periodic in time and equal in both eccentricity forms', () => {
    const times = makeTimes(50, 100);
    const shifted = times.map((t) => t + 3 * 9.1);
    const a = createRvCurveKernel({ times, planets: 1 });
    const b = createRvCurveKernel({ times: shifted, planets: 1 });
    const r = createRvCurveKernel({ times, planets: 1, eccentricityForm: 'root' });
    const p = Float64Array.of(9.1, 0.3, 0.6, 2.0, 12);
    const va = new Float64Array(50);
    const vb = new Float64Array(50);
    const vr = new Float64Array(50);
    a.value(p, va);
    b.value(p, vb);
    r.value(Float64Array.of(9.1, 0.3, Math.sqrt(0.6) * Math.cos(2), Math.sqrt(0.6) * Math.sin(2), 12), vr);
    for (let i = 0; i < 50; i++) {
      expect(Math.abs(va[i] - vb[i])).toBeLessThan(1e-10);
      expect(Math.abs(va[i] - vr[i])).toBeLessThan(1e-10);
    }
  });

  it('reports out-of-support parameters and bad inputs', () => {
    const times = makeTimes(5, 10);
    const k = createRvCurveKernel({ times, planets: 1 });
    const out = new Float64Array(5);
    const g = new Float64Array(5);
    expect(k.value(Float64Array.of(-1, 0, 0.1, 0, 1), out)).toBe(false);
    expect(k.value(Float64Array.of(1, 0, 1, 0, 1), out)).toBe(false);
    expect(k.vjp(Float64Array.of(1, 0, 0.1, Number.NaN, 1), out, g)).toBe(false);
    expect(Array.from(g)).toEqual([0, 0, 0, 0, 0]);
    const r = createRvCurveKernel({ times, planets: 1, eccentricityForm: 'root' });
    expect(r.value(Float64Array.of(1, 0, 0.8, 0.7, 1), out)).toBe(false);
    expect(() => createRvCurveKernel({ times: Float64Array.of(0, Number.NaN), planets: 1 })).toThrow(RvDataError);
    expect(() => createRvCurveKernel({ times: Float64Array.of(0, Number.NaN), planets: 1 })).toThrow(/times\[1\]/);
    expect(() => createRvCurveKernel({ times, planets: 0 })).toThrow(OrbitParameterError);
    expect(() => k.value(Float64Array.of(1, 0, 0.1), out)).toThrow(/params.length/);
  });
});

describe('RV curve vector-Jacobian product', () => {
  const times = makeTimes(120, 900, 3);
  const weights = Float64Array.from({ length: times.length }, (_, i) => Math.cos(1.7 * i) + 0.2);

  /** sum_i w_i v_i(params), the scalar whose gradient the VJP is. */
  function weighted(form: EccentricityForm, params: Float64Array): number {
    const k = createRvCurveKernel({ times, planets: params.length / 5, eccentricityForm: form });
    const out = new Float64Array(times.length);
    if (!k.value(params, out)) return Number.NaN;
    let s = 0;
    for (let i = 0; i < times.length; i++) s += weights[i] * out[i];
    return s;
  }

  // Step per slot: P, tc, a, b, K.
  const steps = [1e-6, 1e-5, 1e-5, 1e-5, 1e-4];

  /**
   * Compares the VJP with differences of `weighted`. Slots in `oneSided` sit on the
   * boundary e = 0 (forward stencil). Slots in `kinked` are (h, k) at h = k = 0, where
   * the curve is only once differentiable (it depends on e cos omega = |h| h): the
   * central stencil then has an O(h) error, removed by extrapolating from h and h/2.
   */
  function checkAgainstDifferences(
    form: EccentricityForm,
    params: Float64Array,
    oneSided: Set<number> = new Set(),
    kinked: Set<number> = new Set(),
  ): void {
    const k = createRvCurveKernel({ times, planets: params.length / 5, eccentricityForm: form });
    const g = new Float64Array(params.length);
    expect(k.vjp(params, weights, g)).toBe(true);
    const g2 = new Float64Array(params.length);
    k.valueForGradient(params, new Float64Array(times.length));
    k.vjpFromLastValue(weights, g2);
    for (let j = 0; j < params.length; j++) {
      expect(Math.abs(g2[j] - g[j])).toBeLessThanOrEqual(1e-12 * (1 + Math.abs(g[j])));
      let h = steps[j % 5] * (j % 5 === 0 ? params[j] : 1);
      // Keep a polar eccentricity inside [0, 1) over the stencil.
      if (form === 'polar' && j % 5 === 2 && !oneSided.has(j)) h = Math.min(h, params[j] / 4, (1 - params[j]) / 4);
      const f = (x: number) => {
        const q = params.slice();
        q[j] = x;
        return weighted(form, q);
      };
      const fd = oneSided.has(j)
        ? // Second-order forward stencil at a boundary of the support (e = 0).
          (-3 * f(params[j]) + 4 * f(params[j] + h) - f(params[j] + 2 * h)) / (2 * h)
        : kinked.has(j)
          ? 2 * derivative(f, params[j], h / 2) - derivative(f, params[j], h)
          : derivative(f, params[j], h);
      const tol = oneSided.has(j) ? 1e-5 * (1 + Math.abs(fd)) : 2e-6 * (1 + Math.abs(fd));
      expect(Math.abs(g[j] - fd), `slot ${j}: analytic ${g[j]} vs differences ${fd}`).toBeLessThan(tol);
    }
  }

  it('matches central differences for three planets at ordinary eccentricities (polar form)', () => {
    checkAgainstDifferences('polar', Float64Array.of(12.3, 1.2, 0.3, 1.1, 35, 101.7, -20, 0.6, -2.5, 8, 3.05, 0.4, 0.1, 0.7, 4));
  });

  it('matches near e = 0 (e = 1e-8) and at e = 0.95, in both forms', () => {
    checkAgainstDifferences('polar', Float64Array.of(12.3, 1.2, 1e-8, -2, 35, 101.7, -20, 0.95, 2.5, 8));
    checkAgainstDifferences('polar', Float64Array.of(40.1, 3, 0.95, -1.5, 20));
    const r = (e: number, w: number) => [Math.sqrt(e) * Math.cos(w), Math.sqrt(e) * Math.sin(w)];
    checkAgainstDifferences('root', Float64Array.of(12.3, 1.2, ...r(1e-8, -2), 35, 101.7, -20, ...r(0.95, 2.5), 8));
  });

  it('is exact at e = 0: zero omega-gradient (polar), zero (h, k) gradient (root)', () => {
    // At e = 0 the curve depends on (h, k) only at second order, and not on omega at fixed tc.
    const k = createRvCurveKernel({ times, planets: 1, eccentricityForm: 'root' });
    const g = new Float64Array(5);
    k.vjp(Float64Array.of(12.3, 1.2, 0, 0, 35), weights, g);
    expect(Math.abs(g[2])).toBe(0);
    expect(Math.abs(g[3])).toBe(0);
    for (const x of [g[0], g[1], g[4]]) expect(Number.isFinite(x)).toBe(true);
    checkAgainstDifferences('root', Float64Array.of(12.3, 1.2, 0, 0, 35), new Set(), new Set([2, 3]));
    checkAgainstDifferences('polar', Float64Array.of(12.3, 1.2, 0, 0.8, 35), new Set([2]));
    const p = createRvCurveKernel({ times, planets: 1 });
    p.vjp(Float64Array.of(12.3, 1.2, 0, 0.8, 35), weights, g);
    expect(Math.abs(g[3])).toBe(0);
  });
});

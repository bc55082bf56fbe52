import { describe, expect, it } from 'vitest';
import {
  OrbitParameterError,
  keplerPartialsInto,
  solveKepler,
  solveKeplerArray,
  solveKeplerWithTrig,
} from '../src/orbit/index.js';

const TWO_PI = 2 * Math.PI;
const DEG = Math.PI / 180;

/**
 * Independent reference: bisection on the monotone f(E) = E - e sin E - M, bracketed by
 * [M - e, M + e] (since |E - M| = e |sin E| <= e), run until the bracket cannot shrink.
 */
function bisectKepler(M: number, e: number): number {
  let lo = M - e - 1e-300;
  let hi = M + e + 1e-300;
  for (let i = 0; i < 3000; i++) {
    const mid = 0.5 * (lo + hi);
    if (mid === lo || mid === hi) break;
    if (mid - e * Math.sin(mid) - M > 0) hi = mid;
    else lo = mid;
  }
  return 0.5 * (lo + hi);
}

const E_GRID = [0, 1e-12, 1e-8, 1e-4, 0.01, 0.05, 0.1, 0.2, 0.3, 0.5, 0.7, 0.8, 0.9, 0.95, 0.99, 0.995, 0.999];

function meanAnomalyGrid(): number[] {
  const ms: number[] = [];
  // Several turns either side of zero, on an irregular grid.
  for (let i = 0; i <= 2000; i++) ms.push(-3 * TWO_PI + (6 * TWO_PI * i) / 2000 + 1e-3 * Math.sin(i));
  // Just above 0, just below 2 pi, and around the reduction boundary at +-pi.
  for (const m of [1e-300, 5e-324, 1e-15, 1e-10, 1e-6]) ms.push(m, -m, TWO_PI - m, TWO_PI + m);
  ms.push(TWO_PI - Number.EPSILON * 4, Math.PI, -Math.PI, Math.PI * (1 - 1e-15), Math.PI * (1 + 1e-15));
  return ms;
}

describe('solveKepler', () => {
  it('reproduces Meeus (1998) Example 30.a: e = 0.1, M = 5 deg gives E = 5.554589 deg', () => {
    // Meeus, Astronomical Algorithms, 2nd ed. (1998), ch. 30, Example 30.a (from memory;
    // reproduced independently by the bisection below).
    const E = solveKepler(5 * DEG, 0.1);
    expect(E / DEG).toBeCloseTo(5.554589, 6);
    expect(Math.abs(E - bisectKepler(5 * DEG, 0.1))).toBeLessThan(1e-15);
  });

  it('satisfies M = E - e sin E to 1e-12 rad on a grid of e in [0, 0.999] and M over several turns', () => {
    // Kepler's equation itself (definition).
    let worst = 0;
    for (const e of E_GRID) {
      for (const M of meanAnomalyGrid()) {
        const E = solveKepler(M, e);
        worst = Math.max(worst, Math.abs(E - e * Math.sin(E) - M));
      }
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('agrees with bisection to 1e-12 rad up to e = 0.999, on a fine grid of one turn', () => {
    // Independent numerical method (bisection) on a grid dense enough to hit the
    // starter's worst region near M = 0 for e -> 1.
    let worst = 0;
    for (const e of E_GRID) {
      for (let i = 0; i <= 20000; i++) {
        const M = -Math.PI + (TWO_PI * i) / 20000;
        worst = Math.max(worst, Math.abs(solveKepler(M, e) - bisectKepler(M, e)));
      }
      for (const M of [1e-9, 1e-6, 1e-4, 1e-3, 1e-2]) {
        worst = Math.max(worst, Math.abs(solveKepler(M, e) - bisectKepler(M, e)));
      }
    }
    expect(worst).toBeLessThan(1e-12);
  });

  it('keeps whole turns: E(M + 2 pi k) = E(M) + 2 pi k, continuous across +-pi', () => {
    // Periodicity of Kepler's equation (E - e sin E - M is invariant under E, M -> +2 pi).
    for (const e of [0, 0.3, 0.9, 0.999]) {
      for (const M of [-3, -1, 0, 0.5, 2, 3.1]) {
        const E0 = solveKepler(M, e);
        for (const k of [-5, -1, 1, 2, 10]) {
          const Mk = M + TWO_PI * k;
          // Rounding of M + 2 pi k is amplified by dE/dM = 1/(1 - e cos E).
          const tol = 1e-13 * (1 + Math.abs(Mk)) / (1 - e);
          expect(Math.abs(solveKepler(Mk, e) - E0 - TWO_PI * k)).toBeLessThan(tol);
        }
      }
      // Continuity across the reduction boundary M = pi (E = pi there for every e).
      const below = solveKepler(Math.PI * (1 - 1e-12), e);
      const above = solveKepler(Math.PI * (1 + 1e-12), e);
      expect(Math.abs(above - below)).toBeLessThan(1e-10);
      expect(Math.abs(solveKepler(Math.PI, e) - Math.PI)).toBeLessThan(1e-15);
    }
  });

  it('returns sin E and cos E consistent with E', () => {
    for (const e of [0, 0.4, 0.999]) {
      for (const M of [-20, -1e-7, 0.3, 2.9, 7]) {
        const r = solveKeplerWithTrig(M, e);
        expect(Math.abs(r.sinE - Math.sin(r.E))).toBeLessThan(1e-14);
        expect(Math.abs(r.cosE - Math.cos(r.E))).toBeLessThan(1e-14);
      }
    }
  });

  it('vectorised form equals the scalar form, with one or per-point eccentricities', () => {
    const M = Float64Array.from({ length: 200 }, (_, i) => -30 + 0.3 * i);
    const ecc = Float64Array.from({ length: 200 }, (_, i) => (i % 100) / 100.5);
    const E = new Float64Array(200);
    const s = new Float64Array(200);
    const c = new Float64Array(200);
    solveKeplerArray(M, 0.6, E, s, c);
    for (let i = 0; i < 200; i++) {
      expect(E[i]).toBe(solveKepler(M[i], 0.6));
      expect(Math.abs(s[i] - Math.sin(E[i]))).toBeLessThan(1e-14);
      expect(Math.abs(c[i] - Math.cos(E[i]))).toBeLessThan(1e-14);
    }
    solveKeplerArray(M, ecc, E);
    for (let i = 0; i < 200; i++) expect(E[i]).toBe(solveKepler(M[i], ecc[i]));
  });

  it('rejects non-finite M and e outside [0, 1), naming the argument', () => {
    expect(() => solveKepler(Number.NaN, 0.1)).toThrow(OrbitParameterError);
    expect(() => solveKepler(Infinity, 0.1)).toThrow(/meanAnomaly/);
    for (const e of [1, -1e-9, 1.5, Number.NaN]) {
      expect(() => solveKepler(1, e)).toThrow(/eccentricity = .*expected a number in \[0, 1\)/);
    }
    const M = Float64Array.of(0, 1, Number.NaN);
    expect(() => solveKeplerArray(M, 0.1, new Float64Array(3))).toThrow(/meanAnomaly\[2\]/);
    expect(() => solveKeplerArray(M.subarray(0, 2), Float64Array.of(0.1, 1), new Float64Array(2))).toThrow(/eccentricity\[1\]/);
    try {
      solveKepler(1, 2);
    } catch (err) {
      expect(err).toBeInstanceOf(RangeError);
      expect((err as OrbitParameterError).field).toBe('eccentricity');
    }
  });
});

describe('Kepler partial derivatives', () => {
  it('match central differences of the solver: dE/dM = 1/(1 - e cos E), dE/de = sin E/(1 - e cos E)', () => {
    // Implicit function theorem on M = E - e sin E (standard calculus).
    const out = new Float64Array(2);
    for (const e of [0, 1e-8, 0.3, 0.95, 0.999]) {
      for (const M of [-7, -0.5, 0.01, 1, 3]) {
        const r = solveKeplerWithTrig(M, e);
        keplerPartialsInto(e, r.sinE, r.cosE, out, 0);
        // Step on the local scale of the root's curvature, D = 1 - e cos E.
        const D = 1 - e * r.cosE;
        const h = 1e-5 * D;
        const dM = (solveKepler(M + h, e) - solveKepler(M - h, e)) / (2 * h);
        expect(Math.abs(out[0] - dM) / out[0]).toBeLessThan(1e-6);
        let de: number;
        if (e === 0) {
          // One-sided at the boundary; second-order forward stencil.
          const he = 1e-6;
          de = (-3 * solveKepler(M, 0) + 4 * solveKepler(M, he) - solveKepler(M, 2 * he)) / (2 * he);
        } else {
          const he = Math.min(1e-5 * D, e / 2);
          de = (solveKepler(M, e + he) - solveKepler(M, e - he)) / (2 * he);
        }
        expect(Math.abs(out[1] - de)).toBeLessThan(1e-6 * Math.max(1e-3, Math.abs(out[1])) * out[0]);
      }
    }
  });
});

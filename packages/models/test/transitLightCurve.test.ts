import { describe, expect, it } from 'vitest';
import { createLightCurveKernel } from '../src/transit/lightCurve.js';
import { quadraticTransitFlux } from '../src/transit/quadraticFlux.js';
import { skySeparation, type TransitOrbit } from '../src/transit/transitGeometry.js';
import { transitDurations } from '../src/transit/durations.js';
import { scaledSemiMajorAxisFromDensity } from '../src/transit/orbitConversions.js';
import { LightCurveDataError, TransitParameterError, TransitWorkspaceError } from '../src/transit/errors.js';
import { integrateWithEndpointMap } from './support/diskIntegration.js';

/** Planet blocks: [P, tc, e, omega, a/R_*, b or i, k]. */
const CIRCULAR = [3.2, 0.4, 0, 0, 9.5, 0.3, 0.1];
const ECCENTRIC = [11.7, -2.1, 0.35, 1.1, 21, 0.5, 0.07];
const U = [0.4, 0.25];

function vector(...parts: number[][]): Float64Array {
  return Float64Array.from(parts.flat());
}

function linspace(a: number, b: number, n: number): Float64Array {
  return Float64Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1));
}

/** Brute-force flux of one planet: geometry and flux functions point by point, no window. */
function bruteForce(t: number, block: number[], u1: number, u2: number, angle: 'impact' | 'inclination' = 'impact'): number {
  const orbit: TransitOrbit = {
    period: block[0],
    tc: block[1],
    eccentricity: block[2],
    omega: block[3],
    scaledSemiMajorAxis: block[4],
    ...(angle === 'impact' ? { impactParameter: block[5] } : { inclination: block[5] }),
  };
  const s = skySeparation(t, orbit);
  return s.inFront ? quadraticTransitFlux(s.z, block[6], u1, u2) : 1;
}

describe('light-curve kernel', () => {
  it('matches point-by-point geometry and flux, so the transit window skips only flat points', () => {
    const blocks = [
      CIRCULAR,
      ECCENTRIC,
      [5.5, 1.0, 0.8, -2.0, 4.5, 0.2, 0.15], // close, very eccentric: wide window
      [2.1, 0.3, 0.6, 2.8, 3.2, 0.9, 0.3], // transit near periastron, grazing
      [8.0, 3.9, 0.2, 4.0, 14, 0.0, 0.05],
      [4.4, -0.7, 0.3, 0.5, 12, 1.08, 0.1], // grazing: the inclination-aware window is tight
    ];
    const times = linspace(-30, 60, 20001);
    for (const block of blocks) {
      const kernel = createLightCurveKernel({ times, planets: 1 });
      const flux = kernel.flux(vector(block, U));
      let inTransit = 0;
      for (let i = 0; i < times.length; i++) {
        const want = bruteForce(times[i], block, U[0], U[1]);
        if (want < 1) inTransit++;
        expect(Math.abs(flux[i] - want), `block ${block} t=${times[i]}`).toBeLessThan(1e-15);
      }
      expect(inTransit).toBeGreaterThan(10);
    }
  });

  it('gives flux 1 and a zero gradient for a planet that never overlaps the star', () => {
    const times = linspace(-5, 5, 2001);
    const kernel = createLightCurveKernel({ times, planets: 1, exposureTime: 0.02, subSamples: 3 });
    // b = 1.1 + 0.02: misses the disk by 0.02 stellar radii at conjunction.
    const params = vector([3, 0, 0.1, 0.4, 8, 1.12, 0.1], U);
    const grad = new Float64Array(kernel.parameterCount).fill(5);
    const flux = kernel.vjp(params, new Float64Array(times.length).fill(1), grad);
    expect(flux.every((f) => f === 1)).toBe(true);
    expect(grad.every((g) => g === 0)).toBe(true);
    for (const t of [0, 0.01, -0.01]) expect(bruteForce(t, [3, 0, 0.1, 0.4, 8, 1.12, 0.1], U[0], U[1])).toBe(1);
  });

  it('accepts the inclination form and adds planets as 1 - Σ deficits', () => {
    const times = linspace(-5, 25, 6001);
    const inc = [7.3, 1.2, 0.6, -2.4, 15, 1.553, 0.12];
    const two = createLightCurveKernel({ times, planets: 2, angle: 'inclination' });
    const eccInc = [ECCENTRIC[0], ECCENTRIC[1], ECCENTRIC[2], ECCENTRIC[3], ECCENTRIC[4], 1.5507, ECCENTRIC[6]];
    const flux = two.flux(vector(inc, eccInc, U));
    let first = 0;
    let second = 0;
    for (let i = 0; i < times.length; i++) {
      const d1 = 1 - bruteForce(times[i], inc, U[0], U[1], 'inclination');
      const d2 = 1 - bruteForce(times[i], eccInc, U[0], U[1], 'inclination');
      if (d1 > 0) first++;
      if (d2 > 0) second++;
      expect(Math.abs(flux[i] - (1 - d1 - d2))).toBeLessThan(1e-15);
    }
    expect(first).toBeGreaterThan(10);
    expect(second).toBeGreaterThan(10);
  });

  /**
   * Times near transits whose every sub-sample keeps z at least 0.02 away from the
   * contact values 1 ± k of every planet: the flux is smooth there (at a contact it
   * has a (Δz)^{3/2} term), so central differences are accurate to ~1e-9.
   */
  function smoothTimes(params: Float64Array, planets: number, angle: 'impact' | 'inclination', exposure: number, sub: number, span: number): Float64Array {
    const list: number[] = [];
    const blocks = Array.from({ length: planets }, (_, p) => Array.from(params.subarray(7 * p, 7 * p + 7)));
    for (let p = 0; p < planets; p++) {
      const [P, tc] = blocks[p];
      for (let j = -1; j <= 1; j++) {
        for (let i = 0; i < 400; i++) {
          const t = tc + j * P * span + (i / 400 - 0.5) * 0.4;
          let ok = false;
          let clear = true;
          for (let s = 0; s < sub; s++) {
            const ts = sub === 1 ? t : t - exposure / 2 + (exposure * (s + 0.5)) / sub;
            for (const b of blocks) {
              const orbit: TransitOrbit = { period: b[0], tc: b[1], eccentricity: b[2], omega: b[3], scaledSemiMajorAxis: b[4], ...(angle === 'impact' ? { impactParameter: b[5] } : { inclination: b[5] }) };
              const pos = skySeparation(ts, orbit);
              if (!pos.inFront) continue;
              if (Math.abs(pos.z - (1 + b[6])) < 0.02 || Math.abs(pos.z - (1 - b[6])) < 0.02) clear = false;
              if (pos.z < 1 + b[6]) ok = true;
            }
          }
          if (ok && clear) list.push(t);
        }
      }
    }
    return Float64Array.from(list);
  }

  it('vector-Jacobian product agrees with central differences of Σ w_i flux_i', () => {
    const configs = [
      { planets: 1, angle: 'impact' as const, params: vector(CIRCULAR, U), exposure: 0, sub: 1 },
      { planets: 1, angle: 'impact' as const, params: vector(ECCENTRIC, U), exposure: 0.02, sub: 5 },
      { planets: 2, angle: 'inclination' as const, params: vector([3.2, 0.4, 0.1, 0.3, 9.5, 1.54, 0.1], [11.7, -2.1, 0.35, 1.1, 21, 1.548, 0.07], U), exposure: 0.0208, sub: 3 },
    ];
    for (const c of configs) {
      const times = smoothTimes(c.params, c.planets, c.angle, c.exposure, c.sub, 1);
      expect(times.length).toBeGreaterThan(150 * c.planets);
      const kernel = createLightCurveKernel({ times, planets: c.planets, angle: c.angle, exposureTime: c.exposure, subSamples: c.sub });
      const weights = Float64Array.from(times, (_, i) => Math.sin(0.37 * i) + 0.2);
      const grad = new Float64Array(kernel.parameterCount);
      const flux = Float64Array.from(kernel.vjp(c.params, weights, grad));
      const plain = kernel.flux(c.params);
      for (let i = 0; i < flux.length; i++) expect(Math.abs(flux[i] - plain[i])).toBeLessThan(1e-15);
      const objective = (j: number, d: number): number => {
        const p = Float64Array.from(c.params);
        p[j] += d;
        const f = kernel.flux(p);
        let s = 0;
        for (let i = 0; i < f.length; i++) s += weights[i] * f[i];
        return s;
      };
      for (let j = 0; j < kernel.parameterCount; j++) {
        if (j % 7 === 2 && c.params[j] === 0) continue; // e = 0: one-sided, checked elsewhere
        const h = 1e-5 * Math.max(1, Math.abs(c.params[j]));
        const fd = (objective(j, -2 * h) - 8 * objective(j, -h) + 8 * objective(j, h) - objective(j, 2 * h)) / (12 * h);
        expect(Math.abs(grad[j] - fd), `${kernel.names[j]}: ${grad[j]} vs ${fd}`).toBeLessThan(1e-7 * Math.max(1, Math.abs(fd)));
      }
      // The kept-Jacobian path gives the same product.
      const again = new Float64Array(kernel.parameterCount);
      kernel.fluxKeepingJacobian(c.params);
      kernel.vjpFromLast(weights, again);
      for (let j = 0; j < kernel.parameterCount; j++) expect(Math.abs(again[j] - grad[j])).toBeLessThan(1e-12 * Math.max(1, Math.abs(grad[j])));
    }
  });

  it('takes the stellar density instead of a/R_*, with the chain rule in P and rho_*', () => {
    // rho_* = 1800 kg m^-3 and P = 3.2 d give a/R_* ≈ 9.5 (Seager & Mallén-Ornelas 2003).
    const rho = 1800;
    const aR = scaledSemiMajorAxisFromDensity(rho, 3.2);
    const byAxis = vector([3.2, 0.4, 0.1, 0.3, aR, 0.3, 0.1], U);
    const byDensity = vector([3.2, 0.4, 0.1, 0.3, rho, 0.3, 0.1], U);
    const times = smoothTimes(byAxis, 1, 'impact', 0, 1, 1);
    const a = createLightCurveKernel({ times, planets: 1 });
    const d = createLightCurveKernel({ times, planets: 1, scale: 'stellarDensity' });
    expect(d.names[4]).toBe('stellarDensity[0]');
    const fa = Float64Array.from(a.flux(byAxis));
    const fd = d.flux(byDensity);
    for (let i = 0; i < times.length; i++) expect(Math.abs(fa[i] - fd[i])).toBeLessThan(1e-14);
    const weights = Float64Array.from(times, (_, i) => Math.cos(i));
    const grad = new Float64Array(d.parameterCount);
    d.vjp(byDensity, weights, grad);
    const kept = new Float64Array(d.parameterCount);
    d.fluxKeepingJacobian(byDensity);
    d.checkParameters(byAxis); // must not disturb the kept Jacobian's chain factors
    d.vjpFromLast(weights, kept);
    for (const j of [0, 4]) {
      const h = 1e-5 * byDensity[j];
      const f = (x: number) => {
        const p = Float64Array.from(byDensity);
        p[j] += x;
        return d.flux(p).reduce((acc, v, i) => acc + weights[i] * v, 0);
      };
      const num = (f(-2 * h) - 8 * f(-h) + 8 * f(h) - f(2 * h)) / (12 * h);
      expect(Math.abs(grad[j] - num), d.names[j]).toBeLessThan(1e-7 * Math.max(1, Math.abs(num)));
      expect(Math.abs(kept[j] - grad[j])).toBeLessThan(1e-12 * Math.max(1, Math.abs(grad[j])));
    }
  });

  it('keeps float64 precision in the period over a long baseline', () => {
    // Transits about 500 periods from tc, where d flux/dP is 500 times d flux/dtc; the
    // product must still match central differences (numerics policy, DESIGN.md).
    const params = vector(CIRCULAR, U);
    const centre = params[1] + 500 * params[0];
    const times = smoothTimes(params, 1, 'impact', 0, 1, 500).filter((t) => t > centre - 1);
    const kernel = createLightCurveKernel({ times, planets: 1 });
    const weights = Float64Array.from(times, (t) => t - centre);
    const grad = new Float64Array(kernel.parameterCount);
    kernel.vjp(params, weights, grad);
    const sumAt = (dP: number): number => {
      const p = Float64Array.from(params);
      p[0] += dP;
      const f = kernel.flux(p);
      let s = 0;
      for (let i = 0; i < f.length; i++) s += weights[i] * f[i];
      return s;
    };
    const h = 1e-8; // moves the transits by 0.4 s
    const fd = (sumAt(-2 * h) - 8 * sumAt(-h) + 8 * sumAt(h) - sumAt(2 * h)) / (12 * h);
    expect(Math.abs(grad[0] / fd - 1)).toBeLessThan(1e-7);
  });
});

describe('exposure-time integration (Kipping 2010, MNRAS 408, 1758)', () => {
  const block = [3.0, 0, 0, 0, 10, 0.2, 0.1];
  const exposure = 30 / 1440;

  const orbit: TransitOrbit = { period: 3, tc: 0, scaledSemiMajorAxis: 10, impactParameter: 0.2 };
  const zAt = (t: number) => skySeparation(t, orbit).z;

  /** The four contact times by bisection on z(t) = 1 ± k (z falls before tc, rises after). */
  const contacts: number[] = [];
  for (const level of [1.1, 0.9]) {
    for (const [a0, b0] of [
      [-0.3, 0],
      [0, 0.3],
    ]) {
      let a = a0;
      let b = b0;
      const sa = Math.sign(zAt(a) - level);
      for (let j = 0; j < 200; j++) {
        const m = (a + b) / 2;
        if (Math.sign(zAt(m) - level) === sa) a = m;
        else b = m;
      }
      contacts.push((a + b) / 2);
    }
  }

  /**
   * Exposure average by an independent fine quadrature of the instantaneous model,
   * split at the contact times (where the light curve has kinks).
   */
  function exactAverage(t: number): number {
    const lo = t - exposure / 2;
    const hi = t + exposure / 2;
    const edges = [lo, ...contacts.filter((c) => c > lo && c < hi).sort((x, y) => x - y), hi];
    let total = 0;
    const f = (s: number) => bruteForce(s, block, U[0], U[1]);
    for (let i = 0; i + 1 < edges.length; i++) total += integrateWithEndpointMap(f, edges[i], edges[i + 1], 80);
    return total / exposure;
  }

  it('converges to the exact exposure average as the number of sub-samples grows', () => {
    const T14 = transitDurations({ period: 3, scaledSemiMajorAxis: 10, radiusRatio: 0.1, impactParameter: 0.2 }).total;
    const times = Float64Array.from([-T14 / 2, -T14 / 2 + 0.004, -0.3 * T14, 0, 0.45 * T14, T14 / 2 + 0.003]);
    const exact = Array.from(times, exactAverage);
    let previous = Infinity;
    const errors: number[] = [];
    for (const n of [1, 3, 9, 27, 81]) {
      const kernel = createLightCurveKernel({ times, planets: 1, exposureTime: exposure, subSamples: n });
      const flux = kernel.flux(vector(block, U));
      const err = Math.max(...Array.from(flux, (f, i) => Math.abs(f - exact[i])));
      errors.push(err);
      expect(err).toBeLessThan(previous);
      previous = err;
    }
    // Midpoint rule on a piecewise-smooth function: at least 1/n^1.5 overall.
    expect(errors[4]).toBeLessThan(errors[0] / 100);
    expect(errors[4]).toBeLessThan(2e-6);
  });

  it('a 30-minute exposure visibly rounds a 2-hour transit (common practice)', () => {
    // a/R_* chosen so that T14 ≈ 2 h for P = 3 d, b = 0.2, k = 0.1.
    const aR = 11.6;
    const T14 = transitDurations({ period: 3, scaledSemiMajorAxis: aR, radiusRatio: 0.1, impactParameter: 0.2 }).total;
    expect(Math.abs(T14 * 24 - 2)).toBeLessThan(0.25);
    const times = linspace(-0.08, 0.08, 801);
    const sharp = createLightCurveKernel({ times, planets: 1 }).flux(vector([3, 0, 0, 0, aR, 0.2, 0.1], U));
    const smeared = createLightCurveKernel({ times, planets: 1, exposureTime: exposure, subSamples: 15 }).flux(vector([3, 0, 0, 0, aR, 0.2, 0.1], U));
    const depth = 1 - Math.min(...sharp);
    let worst = 0;
    for (let i = 0; i < times.length; i++) worst = Math.max(worst, Math.abs(sharp[i] - smeared[i]));
    expect(worst).toBeGreaterThan(0.1 * depth);
    // Smearing spreads the deficit: the integrated curve starts dimming earlier.
    const firstSharp = Array.from(sharp).findIndex((f) => f < 1);
    const firstSmeared = Array.from(smeared).findIndex((f) => f < 1);
    expect(firstSmeared).toBeLessThan(firstSharp);
  });
});

describe('light-curve kernel validation', () => {
  it('names the bad row, field or slot', () => {
    expect(() => createLightCurveKernel({ times: Float64Array.from([0, Number.NaN]), planets: 1 })).toThrow(/times\[1\] = NaN/);
    expect(() => createLightCurveKernel({ times: new Float64Array(3), planets: 1, exposureTime: 0.02 })).toThrow(LightCurveDataError);
    expect(() => createLightCurveKernel({ times: new Float64Array(3), planets: 1, exposureTime: Float64Array.from([0.1, -1, 0]), subSamples: 3 })).toThrow(/exposureTime\[1\]/);
    expect(() => createLightCurveKernel({ times: new Float64Array(3), planets: 0 })).toThrow(/planets/);
    const kernel = createLightCurveKernel({ times: new Float64Array(3), planets: 1 });
    expect(() => kernel.flux(new Float64Array(5))).toThrow(TransitWorkspaceError);
    expect(() => kernel.flux(vector([3, 0, 1.2, 0, 10, 0.2, 0.1], U))).toThrow(/eccentricity\[0\] = 1.2/);
    expect(() => kernel.flux(vector([3, 0, 0, 0, 10, 12, 0.1], U))).toThrow(TransitParameterError);
    expect(kernel.fluxKeepingJacobian(vector([3, 0, 0, 0, 0.5, 0.2, 0.1], U))).toBeNull();
    expect(kernel.checkParameters(vector([3, 0, 0, 0, 0.5, 0.2, 0.1], U))).toBe(4);
    expect(() => kernel.vjpFromLast(new Float64Array(3), new Float64Array(9))).toThrow(TransitWorkspaceError);
  });
});

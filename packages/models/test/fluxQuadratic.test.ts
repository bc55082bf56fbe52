import { describe, expect, it } from 'vitest';
import {
  quadraticTransitFlux,
  quadraticTransitFluxWithPartials,
} from '../src/transit/quadraticFlux.js';
import { TransitParameterError } from '../src/transit/errors.js';
import { EARTH_RADIUS_M, SOLAR_RADIUS_M } from '../src/orbit/constants.js';
import { fluxByAnnuli, fluxByPlanetPolar, overlapArea } from './support/diskIntegration.js';

// Limb-darkening pairs inside the physical region (u1 > 0, u1 + u2 < 1, u1 + 2 u2 > 0;
// Kipping 2013, MNRAS 435, 2152), plus the uniform source.
const LIMB: [number, number][] = [
  [0, 0],
  [0.4, 0.25],
  [0.9, -0.15],
  [0.1, 0.6],
];

/** Named geometric cases (z, k in stellar radii), Mandel & Agol (2002) Table 1 cases. */
const CASES: { name: string; z: number; k: number }[] = [
  { name: 'no overlap', z: 1.3, k: 0.1 },
  { name: 'ingress, small planet', z: 1.05, k: 0.1 },
  { name: 'egress, deep in the limb', z: 0.93, k: 0.1 },
  { name: 'inside, off centre', z: 0.5, k: 0.1 },
  { name: 'inside, covering the centre', z: 0.05, k: 0.1 },
  { name: 'inside, large planet covering the centre', z: 0.2, k: 0.6 },
  { name: 'grazing (never fully inside)', z: 0.95, k: 0.3 },
  { name: 'grazing, centre outside the star', z: 1.2, k: 0.3 },
  { name: 'crossing with z < k', z: 0.5, k: 0.8 },
  { name: 'k > 1, partial', z: 0.7, k: 1.3 },
  { name: 'k > 1, partial far out', z: 2.0, k: 1.3 },
  { name: 'k > 1, star fully covered', z: 0.2, k: 1.3 },
  { name: 'k = 1, small offset', z: 0.01, k: 1 },
  { name: 'z = 0', z: 0, k: 0.25 },
  { name: 'z = k', z: 0.3, k: 0.3 },
  { name: 'z = k (small planet)', z: 0.01, k: 0.01 },
  { name: 'z = 1 - k', z: 0.75, k: 0.25 },
  { name: 'z = 1 + k (first contact)', z: 1.25, k: 0.25 },
  { name: 'k = 1/2, z = 1/2 (z = k = 1 - k)', z: 0.5, k: 0.5 },
  { name: 'k = 1/2, z = 0.2', z: 0.2, k: 0.5 },
  { name: 'z = k - 1 (k > 1, internal contact)', z: 0.4, k: 1.4 },
  { name: 'z = k > 1', z: 1.4, k: 1.4 },
  { name: 'tiny planet near the limb', z: 0.9995, k: 0.001 },
];

describe('quadraticTransitFlux against independent numerical integration', () => {
  it('matches the annulus integration to 1e-10 in every geometric case', () => {
    // Independent check: 1-D integral over stellar radius of the hidden arc of each
    // annulus (exact geometry), test/support/diskIntegration.ts. CHECKS.md asks 1e-7.
    for (const { name, z, k } of CASES) {
      for (const [u1, u2] of LIMB) {
        const analytic = quadraticTransitFlux(z, k, u1, u2);
        const numeric = fluxByAnnuli(z, k, u1, u2, 300);
        expect(Math.abs(analytic - numeric), `${name}, u = (${u1}, ${u2})`).toBeLessThan(1e-10);
      }
    }
  });

  it('matches a 2-D polar integration centred on the planet to 1e-8', () => {
    for (const { name, z, k } of CASES) {
      const analytic = quadraticTransitFlux(z, k, 0.4, 0.25);
      const numeric = fluxByPlanetPolar(z, k, 0.4, 0.25);
      expect(Math.abs(analytic - numeric), name).toBeLessThan(1e-8);
    }
  });

  it('matches the annulus integration on a sweep of z for several k', () => {
    for (const k of [0.003, 0.05, 0.2, 0.5, 0.9, 1, 1.7]) {
      for (let i = 0; i <= 40; i++) {
        const z = ((1 + k + 0.05) * i) / 40;
        const analytic = quadraticTransitFlux(z, k, 0.3, 0.3);
        const numeric = fluxByAnnuli(z, k, 0.3, 0.3, 200);
        expect(Math.abs(analytic - numeric), `z = ${z}, k = ${k}`).toBeLessThan(1e-10);
      }
    }
  });

  it('is continuous to rounding level across z = k, z = 1 - k and z = 1 + k', () => {
    for (const k of [0.1, 0.5, 0.7]) {
      for (const edge of [k, 1 - k, 1 + k]) {
        for (const [u1, u2] of LIMB) {
          const below = quadraticTransitFlux(edge * (1 - 1e-13), k, u1, u2);
          const at = quadraticTransitFlux(edge, k, u1, u2);
          const above = quadraticTransitFlux(edge * (1 + 1e-13), k, u1, u2);
          expect(Math.abs(below - at), `k=${k} edge=${edge}`).toBeLessThan(1e-12);
          expect(Math.abs(above - at), `k=${k} edge=${edge}`).toBeLessThan(1e-12);
        }
      }
    }
  });
});

describe('quadraticTransitFlux limits', () => {
  it('uniform source: flux = 1 - (overlap area)/π (Mandel & Agol 2002, eq. 1)', () => {
    for (const k of [0.01, 0.1, 0.5, 1, 1.5]) {
      for (let i = 0; i <= 30; i++) {
        const z = ((1 + k + 0.1) * i) / 30;
        expect(Math.abs(quadraticTransitFlux(z, k, 0, 0) - (1 - overlapArea(z, k) / Math.PI))).toBeLessThan(1e-14);
      }
    }
  });

  it('small planet: central depth ≈ k² I(1)/<I>, <I>/I(1) = 1 - u1/3 - u2/6 (Mandel & Agol 2002)', () => {
    const k = 1e-3;
    for (const [u1, u2] of LIMB) {
      const depth = 1 - quadraticTransitFlux(0, k, u1, u2);
      const approx = (k * k) / (1 - u1 / 3 - u2 / 6);
      // The neglected term is the variation of I over the planet, O(k²) relative.
      expect(Math.abs(depth / approx - 1)).toBeLessThan(1e-5);
    }
    // Off centre the depth follows the local intensity I(μ)/<I> (same approximation).
    const z = 0.6;
    const mu = Math.sqrt(1 - z * z);
    const depth = 1 - quadraticTransitFlux(z, k, 0.4, 0.25);
    const local = 1 - 0.4 * (1 - mu) - 0.25 * (1 - mu) ** 2;
    expect(Math.abs(depth / ((k * k * local) / (1 - 0.4 / 3 - 0.25 / 6)) - 1)).toBeLessThan(1e-5);
  });

  it('Earth–Sun central depth without limb darkening ≈ 84 ppm (common practice)', () => {
    // Nominal radii: IAU 2015 Resolution B3 (src/orbit/constants.ts).
    const k = EARTH_RADIUS_M / SOLAR_RADIUS_M;
    const depthPpm = (1 - quadraticTransitFlux(0, k, 0, 0)) * 1e6;
    expect(Math.abs(depthPpm - 84)).toBeLessThan(0.5);
  });

  it('stays accurate for k = 1 at vanishing offsets, where 1 - (z - k)² and (z + k)² - 1 are tiny', () => {
    // The flux rises from 0 at z = 0 (full coverage); compare with the annulus integral.
    let previous = 0;
    for (const z of [1e-300, 1e-20, 1e-12, 1e-8, 1e-4]) {
      const f = quadraticTransitFlux(z, 1, 0.4, 0.25);
      expect(Math.abs(f - fluxByAnnuli(z, 1, 0.4, 0.25, 300)), `z=${z}`).toBeLessThan(5e-15);
      expect(f).toBeGreaterThanOrEqual(previous);
      previous = f;
    }
  });

  it('is 1 without overlap and 0 when a larger planet covers the star', () => {
    expect(quadraticTransitFlux(1.2, 0.1, 0.4, 0.2)).toBe(1);
    expect(quadraticTransitFlux(1.1, 0.1, 0.4, 0.2)).toBe(1);
    expect(quadraticTransitFlux(0.1, 1.5, 0.4, 0.2)).toBe(0);
  });
});

/** Fourth-order central difference. */
function derivative(f: (x: number) => number, x: number, h: number): number {
  return (f(x - 2 * h) - 8 * f(x - h) + 8 * f(x + h) - f(x + 2 * h)) / (12 * h);
}

describe('quadraticTransitFluxWithPartials', () => {
  const out = new Float64Array(5);

  function checkPartials(z: number, k: number, u1: number, u2: number, h: number, tol: number, label: string): void {
    const value = quadraticTransitFluxWithPartials(z, k, u1, u2, out);
    expect(value).toBe(out[0]);
    expect(Math.abs(value - quadraticTransitFlux(z, k, u1, u2))).toBeLessThan(1e-15);
    const dz = derivative((x) => quadraticTransitFlux(x, k, u1, u2), z, h);
    const dk = derivative((x) => quadraticTransitFlux(z, x, u1, u2), k, h);
    const du1 = derivative((x) => quadraticTransitFlux(z, k, x, u2), u1, 1e-3);
    const du2 = derivative((x) => quadraticTransitFlux(z, k, u1, x), u2, 1e-3);
    expect(Math.abs(out[1] - dz), `${label} d/dz`).toBeLessThan(tol);
    expect(Math.abs(out[2] - dk), `${label} d/dk`).toBeLessThan(tol);
    expect(Math.abs(out[3] - du1), `${label} d/du1`).toBeLessThan(1e-11);
    expect(Math.abs(out[4] - du2), `${label} d/du2`).toBeLessThan(1e-11);
  }

  it('agrees with float64 central differences in each geometric case', () => {
    for (const { name, z, k } of CASES) {
      // Keep the stencil on one side of every case boundary and well inside the
      // smallest length scale of the geometry (z itself when k = 1).
      const dist = Math.min(...[0, k, 1 - k, 1 + k, Math.abs(k - 1)].map((b) => Math.abs(z - b)));
      if (dist < 1e-3) continue; // the special points are checked below
      for (const [u1, u2] of LIMB) checkPartials(z, k, u1, u2, Math.min(1e-3, dist / 40), 1e-8, name);
    }
  });

  it('agrees with central differences just either side of z = k, z = 1 - k and z = 1 + k', () => {
    for (const k of [0.1, 0.5, 0.7, 1.3]) {
      for (const edge of [k, 1 - k, 1 + k, k - 1]) {
        for (const offset of [-1e-3, -1e-5, 1e-5, 1e-3]) {
          const z = edge + offset;
          if (z <= 0) continue;
          // Near a contact point the flux has a (z - edge)·log|z - edge| term, so the
          // step shrinks with the distance; the tolerance covers the truncation error.
          checkPartials(z, k, 0.4, 0.25, Math.abs(offset) / 8, 5e-7, `k=${k}, z=${z}`);
        }
      }
    }
  });

  it('is continuous at the special points, where it takes the one-sided limits', () => {
    const at = new Float64Array(5);
    const near = new Float64Array(5);
    for (const [z, k] of [
      [0.3, 0.3],
      [0.75, 0.25],
      [0.5, 0.5],
      [0.4, 1.4],
      [1.4, 1.4],
    ]) {
      quadraticTransitFluxWithPartials(z, k, 0.4, 0.25, at);
      for (const side of [-1, 1]) {
        quadraticTransitFluxWithPartials(z + side * 1e-12, k, 0.4, 0.25, near);
        // At an internal contact the lens's corner angle opens like √|Δz|, so the
        // partials change like √|Δz| there (2e-7 at 1e-12 here; common geometry).
        for (let i = 0; i < 5; i++) expect(Math.abs(at[i] - near[i]), `z=${z} k=${k} slot ${i}`).toBeLessThan(1e-6);
      }
    }
  });

  it('has zero z-derivative at z = 0 (the flux is even in z)', () => {
    quadraticTransitFluxWithPartials(0, 0.2, 0.4, 0.25, out);
    expect(Math.abs(out[1])).toBeLessThan(1e-15);
    const dk = derivative((x) => quadraticTransitFlux(0, x, 0.4, 0.25), 0.2, 1e-4);
    expect(Math.abs(out[2] - dk)).toBeLessThan(1e-10);
  });

  it('writes at an offset and rejects a short buffer', () => {
    const big = new Float64Array(8);
    quadraticTransitFluxWithPartials(0.5, 0.1, 0.4, 0.25, big, 3);
    expect(big[3]).toBe(quadraticTransitFlux(0.5, 0.1, 0.4, 0.25));
    expect(() => quadraticTransitFluxWithPartials(0.5, 0.1, 0.4, 0.25, new Float64Array(4))).toThrow(TransitParameterError);
  });
});

describe('quadraticTransitFlux input validation', () => {
  it('names the field, the value and what was expected', () => {
    expect(() => quadraticTransitFlux(-0.1, 0.1, 0.4, 0.2)).toThrow(/z = -0.1: expected a finite number >= 0/);
    expect(() => quadraticTransitFlux(0.1, 0, 0.4, 0.2)).toThrow(/k = 0: expected a finite number > 0/);
    expect(() => quadraticTransitFlux(Number.NaN, 0.1, 0.4, 0.2)).toThrow(/z = NaN/);
    expect(() => quadraticTransitFlux(0.1, 0.1, Infinity, 0.2)).toThrow(/u1 = Infinity/);
    expect(() => quadraticTransitFlux(0.1, 0.1, 3, 0)).toThrow(TransitParameterError);
  });
});

import { createRandomStream } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { createJointModel, createRvModel, createTransitModel, type PlanetSystemModel } from '../src/index.js';
import { ORIGIN, lightCurve, rvData, transitWindows, twoPlanets } from './builderFixtures.js';

/**
 * The whole log-density of each builder, as the sampler sees it (priors, Jacobians of
 * the centred supports, the unit disk, the impact fraction b/(1 + k), the conjunction sampled near the data, the duration-scaled
 * density, the fused likelihoods), has a gradient equal to float64 central differences
 * (standard calculus; step 1e-5 in the sampler's coordinates, whose unit is about one
 * posterior standard deviation, so truncation error is ~1e-10 and rounding ~1e-7).
 * Positions: the centre, random points about it, and points with e ≈ 1e-8.
 */

function expectGradient(model: PlanetSystemModel, x: Float64Array, h = 1e-5, tol = 1e-5): void {
  const g = new Float64Array(model.dim);
  const lp = model.logDensityGrad(x, g);
  expect(Number.isFinite(lp)).toBe(true);
  const scratch = new Float64Array(model.dim);
  for (let i = 0; i < model.dim; i++) {
    const up = Float64Array.from(x);
    const down = Float64Array.from(x);
    up[i] += h;
    down[i] -= h;
    const numeric = (model.logDensityGrad(up, scratch) - model.logDensityGrad(down, scratch)) / (2 * h);
    const err = Math.abs(g[i] - numeric);
    if (err > tol * (1 + Math.abs(numeric))) {
      throw new Error(`${model.names[i]}: analytic ${g[i]}, numeric ${numeric}`);
    }
  }
}

function positions(model: PlanetSystemModel, seed: string, n = 3): Float64Array[] {
  const s = createRandomStream(seed);
  const out = [new Float64Array(model.dim)];
  for (let k = 0; k < n; k++) out.push(Float64Array.from({ length: model.dim }, () => s.normal()));
  return out;
}

describe('builder gradients', () => {
  it('radial velocities: two eccentric planets, two instruments, quadratic trend, stellar mass', async () => {
    const model = await createRvModel({
      rv: rvData(50, 'grad-rv'),
      planets: [
        { label: 'b', period: 4.2317 },
        { label: 'c', period: 21.9 },
      ],
      star: { mass: 0.92, massUncertainty: 0.04 },
      trend: 'quadratic',
      priors: { eccentricity_c: { beta: [0.867, 3.03] }, eccentricity_b: { uniform: [0, 0.6] } },
    });
    for (const x of positions(model, 'grad-rv-x')) expectGradient(model, x);
    // Near-circular orbits: e ≈ 1e-8 for both planets.
    const near = model.positionOf({ sqrtEcosW_b: 1e-4, sqrtEsinW_b: -3e-5, sqrtEcosW_c: -2e-5, sqrtEsinW_c: 9e-5 });
    expect(model.valuesAt(near).eccentricity_b).toBeCloseTo(1.09e-8, 12);
    expectGradient(model, near, 1e-6, 1e-4);
  });

  it('transits: two planets, two light curves in two bands, exposure smearing, dilution, eccentric orbit, given density prior', async () => {
    const [b, c] = twoPlanets;
    const model = await createTransitModel({
      lightCurves: [
        lightCurve('wide', [b, c], transitWindows(b, 60, 10 / 1440, 0.15), 'grad-lc-1'),
        lightCurve('red', [b, c], transitWindows(c, 60, 4 / 1440, 0.25), 'grad-lc-2', { exposureTime: 4 / 1440, dilution: 0.1 }),
      ].map((lc, i) => ({ ...lc, ...(i === 1 ? { dilution: true, band: 'redBand' } : {}) })),
      planets: [
        { label: 'b', period: b.period, tc: b.tc, eccentric: true },
        { label: 'c', period: c.period, tc: c.tc },
      ],
      star: { density: 1.8, densityUncertainty: 0.3 },
    });
    expect(model.names).toContain('centralTransitDensity.u');
    for (const x of positions(model, 'grad-lc-x')) expectGradient(model, x);
    expectGradient(model, model.positionOf({ sqrtEcosW_b: 7e-5, sqrtEsinW_b: 7e-5 }), 1e-6, 1e-4);
  });

  it('transits: a/R_* per planet, (u1, u2) limb darkening, circular orbits', async () => {
    const [b] = twoPlanets;
    const model = await createTransitModel({
      lightCurves: [lightCurve('wide', [b], transitWindows(b, 40, 5 / 1440, 0.15), 'grad-lc-3', { exposureTime: 5 / 1440 })],
      planets: [{ label: 'b', period: b.period, tc: b.tc }],
      geometry: 'scaledAxis',
      limbDarkening: 'quadratic',
      priors: { scaledSemiMajorAxis_b: { logNormal: [2.5, 0.3] } },
    });
    expect(model.names).toContain('centralTransitAxis_b.u');
    for (const x of positions(model, 'grad-lc-y')) expectGradient(model, x);
  });

  it('joint: a transiting eccentric planet and one seen only in radial velocities, stellar mass and radius', async () => {
    const [b, c] = twoPlanets;
    const rv = rvData(40, 'grad-joint-rv');
    const lc = lightCurve('wide', [b], transitWindows(b, 30, 10 / 1440, 0.15), 'grad-joint-lc');
    const model = await createJointModel({
      rv,
      lightCurves: [lc],
      planets: [
        { label: 'b', period: b.period, tc: b.tc },
        { label: 'c', period: c.period, tc: c.tc, transiting: false },
      ],
      star: { mass: 0.92, massUncertainty: 0.04, radius: 0.87, radiusUncertainty: 0.03 },
      trend: 'linear',
    });
    for (const x of positions(model, 'grad-joint-x')) expectGradient(model, x);
    expectGradient(model, model.positionOf({ sqrtEcosW_b: -6e-5, sqrtEsinW_b: 8e-5, sqrtEcosW_c: 1e-4, sqrtEsinW_c: 1e-5 }), 1e-6, 1e-4);
    const times = [...(rv.times as number[]), ...(lc.times as Float64Array)];
    expect(model.epoch).toBe(Math.round(0.5 * (Math.min(...times) + Math.max(...times)))); // middle of the data, rounded
  });
});

import { describe, expect, it } from 'vitest';
import { createJointModel, createRvModel, createTransitModel, solveKepler } from '../src/index.js';
import { ORIGIN, lightCurve, rvData, transitWindows, twoPlanets } from './builderFixtures.js';

/**
 * Derived quantities in the trace against formulas written out here, independently of
 * the library's own code. Constants: IAU 2015 Resolution B3 nominal values
 * (GM_sun = 1.3271244e20 m³ s⁻², GM_earth = 3.986004e14, GM_jup = 1.2668653e17,
 * R_sun = 6.957e8 m, R_earth = 6.3781e6 m, R_jup = 7.1492e7 m), CODATA 2018
 * G = 6.6743e-11, IAU 2012 au = 149597870700 m.
 */
const GM_SUN = 1.3271244e20;
const GM_EARTH = 3.986004e14;
const GM_JUP = 1.2668653e17;
const G = 6.6743e-11;
const AU = 149597870700;
const R_SUN = 6.957e8;
const R_EARTH = 6.3781e6;
const R_JUP = 7.1492e7;
const DAY = 86400;
const DEG = Math.PI / 180;

/** Lovis & Fischer (2010, in "Exoplanets", ed. Seager, eq. 1): K in m/s from masses in solar units. */
function semiAmplitude(P: number, e: number, m: number, M: number, sinI: number): number {
  return (Math.cbrt((2 * Math.PI * GM_SUN) / (P * DAY)) * m * sinI) / Math.pow(M + m, 2 / 3) / Math.sqrt(1 - e * e);
}

/** Winn (2010), eqs. 14–16: duration between contacts at separation `reach`, days. */
function winnDuration(P: number, aR: number, reach: number, b: number, inc: number, e: number, w: number): number {
  return (P / Math.PI) * Math.asin(Math.sqrt(reach * reach - b * b) / (aR * Math.sin(inc))) * (Math.sqrt(1 - e * e) / (1 + e * Math.sin(w)));
}

describe('derived quantities of a joint model', () => {
  it('match Kepler, Winn (2010), Seager & Mallén-Ornelas (2003) and Lovis & Fischer (2010)', async () => {
    const [b, c] = twoPlanets;
    const model = await createJointModel({
      rv: rvData(40, 'derived-rv'),
      lightCurves: [{ ...lightCurve('wide', [b], transitWindows(b, 30, 10 / 1440, 0.15), 'derived-lc'), band: 'visible' }],
      planets: [
        { label: 'b', period: b.period, tc: b.tc },
        { label: 'c', period: c.period, tc: c.tc, transiting: false },
      ],
      star: { mass: 0.92, massUncertainty: 0.04, radius: 0.87, radiusUncertainty: 0.03 },
      searchMode: false,
    });
    const x = model.positionOf({
      period_b: 4.2318,
      sqrtEcosW_b: 0.3,
      sqrtEsinW_b: -0.25,
      semiAmplitude_b: 31,
      radiusRatio_b: 0.081,
      impactParameter_b: 0.45,
      starDensity: 2.1,
      starMass: 0.9,
      starRadius: 0.85,
      sqrtEcosW_c: -0.2,
      sqrtEsinW_c: 0.4,
      semiAmplitude_c: 9.5,
      q1_visible: 0.4,
      q2_visible: 0.3,
    });
    const v = model.valuesAt(x);
    // Sampled values come back as given.
    expect(v.period_b).toBeCloseTo(4.2318, 12);
    expect(v.impactParameter_b).toBeCloseTo(0.45, 12);
    expect(v.starDensity).toBeCloseTo(2.1, 12);

    const e = 0.3 ** 2 + 0.25 ** 2;
    const w = Math.atan2(-0.25, 0.3);
    expect(v.eccentricity_b).toBeCloseTo(e, 14);
    expect(v.omega_b).toBeCloseTo(w / DEG, 11);

    // Time of periastron: at tc the true anomaly is π/2 − ω (Winn 2010, conjunction).
    const M = (2 * Math.PI * (v.tc_b - v.periastronTime_b)) / v.period_b;
    const E = solveKepler(M, e);
    const f = 2 * Math.atan(Math.sqrt((1 + e) / (1 - e)) * Math.tan(E / 2));
    const diff = f - (Math.PI / 2 - w);
    expect(Math.abs(diff - 2 * Math.PI * Math.round(diff / (2 * Math.PI)))).toBeLessThan(1e-10);

    // a/R_* from the stellar density (Seager & Mallén-Ornelas 2003): ρ = 3π (a/R_*)³ / (G P²).
    const P = v.period_b * DAY;
    const aR = Math.cbrt((2.1 * 1000 * G * P * P) / (3 * Math.PI));
    expect(v.scaledSemiMajorAxis_b).toBeCloseTo(aR, 10);
    // Inclination from b (Winn 2010, eq. 7).
    const inc = Math.acos((0.45 * (1 + e * Math.sin(w))) / (aR * (1 - e * e)));
    expect(v.inclination_b).toBeCloseTo(inc / DEG, 9);
    // Durations (Winn 2010, eqs. 14–16), hours.
    expect(v.totalDuration_b).toBeCloseTo(24 * winnDuration(v.period_b, aR, 1.081, 0.45, inc, e, w), 9);
    expect(v.fullDuration_b).toBeCloseTo(24 * winnDuration(v.period_b, aR, 0.919, 0.45, inc, e, w), 9);

    // Masses: the derived masses give back K through Lovis & Fischer (2010), eq. 1.
    const mEarth = GM_EARTH / GM_SUN;
    const mJup = GM_JUP / GM_SUN;
    const ec = 0.2 ** 2 + 0.4 ** 2;
    expect(semiAmplitude(v.period_c, ec, v.minimumMass_c * mEarth, 0.9, 1)).toBeCloseTo(9.5, 10);
    expect(v.minimumMassJupiter_c * mJup).toBeCloseTo(v.minimumMass_c * mEarth, 14);
    expect(semiAmplitude(v.period_b, e, v.planetMass_b * mEarth, 0.9, Math.sin(inc))).toBeCloseTo(31, 10);
    expect(v.planetMass_b).toBeGreaterThan(v.minimumMass_b);
    // Kepler's third law: a³ = G (M + m) P² / (4π²), in au.
    const a = Math.cbrt((GM_SUN * (0.9 + v.planetMass_b * mEarth) * P * P) / (4 * Math.PI * Math.PI)) / AU;
    expect(v.semiMajorAxis_b).toBeCloseTo(a, 12);
    // Radii and bulk density.
    expect(v.planetRadius_b).toBeCloseTo((0.081 * 0.85 * R_SUN) / R_EARTH, 10);
    expect(v.planetRadiusJupiter_b).toBeCloseTo((0.081 * 0.85 * R_SUN) / R_JUP, 10);
    const mass = (v.planetMass_b * GM_EARTH) / G; // kg
    const radius = 0.081 * 0.85 * R_SUN;
    expect(v.planetDensity_b).toBeCloseTo(mass / ((4 / 3) * Math.PI * radius ** 3) / 1000, 9);
    // Limb darkening (Kipping 2013, eqs. 15–16).
    expect(v.u1_visible).toBeCloseTo(2 * Math.sqrt(0.4) * 0.3, 14);
    expect(v.u2_visible).toBeCloseTo(Math.sqrt(0.4) * (1 - 0.6), 14);
    // Units are stated for every column.
    for (const name of model.outputs.names) expect(model.units[name]).toBeDefined();
    expect(model.units.totalDuration_b).toBe('h');
    expect(model.units.inclination_b).toBe('deg');
  });
});

describe('derived quantities against check values', () => {
  const times = Array.from({ length: 30 }, (_, i) => ORIGIN + 40 * i);

  it('a Jupiter analogue: K = 12.5 m/s gives about one Jupiter mass; an Earth analogue 0.09 m/s about one Earth mass at 1 au', async () => {
    // Check values of the shared notes (common practice): Jupiter analogue about 12.5 m/s,
    // Earth analogue about 0.09 m/s; P = 4332.59 d and 365.256 d (from memory).
    for (const [period, K, unit, expected] of [
      [4332.59, 12.5, 'minimumMassJupiter_x', 1],
      [365.256, 0.0894, 'minimumMass_x', 1],
    ] as const) {
      const model = await createRvModel({
        rv: { times, values: times.map(() => 0), errors: times.map(() => 1), instrument: 'only' },
        planets: [{ label: 'x', period, tc: ORIGIN, eccentric: false }],
        star: { mass: 1 },
        priors: { semiAmplitude_x: { logUniform: [0.01, 100] } },
        searchMode: false,
      });
      const v = model.valuesAt(model.positionOf({ semiAmplitude_x: K }));
      expect(Math.abs(v[unit] / expected - 1)).toBeLessThan(0.03);
      if (period < 400) expect(v.semiMajorAxis_x).toBeCloseTo(1, 3);
    }
  });

  it('Earth and Sun: depth k² ≈ 84 ppm, central duration about 13 h (Winn 2010), solar density 1.41 g/cm³', async () => {
    const k = R_EARTH / R_SUN; // (R_earth/R_sun)² ≈ 84 ppm (common practice)
    expect(k * k * 1e6).toBeCloseTo(84, 0);
    const lcTimes = Array.from({ length: 40 }, (_, i) => ORIGIN - 1 + i * 0.05);
    const model = await createTransitModel({
      lightCurves: [{ label: 'one', times: lcTimes, flux: lcTimes.map(() => 1), errors: lcTimes.map(() => 1e-5) }],
      planets: [{ label: 'x', period: 365.256, tc: ORIGIN, scaledSemiMajorAxis: 215 }],
      geometry: 'scaledAxis',
      searchMode: false,
    });
    const aR = AU / R_SUN; // 215.03
    const v = model.valuesAt(model.positionOf({ period_x: 365.256, scaledSemiMajorAxis_x: aR, impactParameter_x: 0, radiusRatio_x: k }));
    expect(v.totalDuration_x).toBeGreaterThan(12.9);
    expect(v.totalDuration_x).toBeLessThan(13.2);
    // Numerical contact times of the circular orbit: z(t) = (a/R_*) sin(2π t/P) at b = 0.
    let lo = 0;
    let hi = 0.3;
    for (let it = 0; it < 200; it++) {
      const mid = 0.5 * (lo + hi);
      if (aR * Math.sin((2 * Math.PI * mid) / 365.256) < 1 + k) lo = mid;
      else hi = mid;
    }
    expect(v.totalDuration_x).toBeCloseTo(2 * 24 * lo, 8);
    expect(v.starDensity_x).toBeCloseTo((GM_SUN / G / ((4 / 3) * Math.PI * R_SUN ** 3)) / 1000, 3);
  });
});

import { describe, expect, it } from 'vitest';
import { skySeparation, skySeparationWithPartials, type TransitOrbit } from '../src/transit/transitGeometry.js';
import {
  impactFromInclination,
  inclinationFromImpact,
  scaledSemiMajorAxisFromDensity,
  scaledSemiMajorAxisFromDensityPartials,
  stellarDensityFromScaledSemiMajorAxis,
} from '../src/transit/orbitConversions.js';
import { transitDurations } from '../src/transit/durations.js';
import { AU_M, GRAVITATIONAL_CONSTANT, SOLAR_GM, SOLAR_RADIUS_M } from '../src/orbit/constants.js';
import { TransitParameterError } from '../src/transit/errors.js';
import { createLightCurveKernel } from '../src/transit/lightCurve.js';

/**
 * Independent reference: Winn (2010) eqs. 2-4 evaluated literally, with Kepler's
 * equation solved by bisection and the true anomaly from tan(f/2).
 */
function winnPosition(t: number, o: Required<Pick<TransitOrbit, 'period' | 'tc' | 'eccentricity' | 'omega' | 'scaledSemiMajorAxis'>> & { inclination: number }) {
  const { period: P, tc, eccentricity: e, omega: w, scaledSemiMajorAxis: aR, inclination: inc } = o;
  const fc = Math.PI / 2 - w;
  const Ec = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(fc / 2));
  const Mc = Ec - e * Math.sin(Ec);
  let M = (2 * Math.PI * (t - tc)) / P + Mc;
  M -= 2 * Math.PI * Math.floor(M / (2 * Math.PI));
  let lo = 0;
  let hi = 2 * Math.PI;
  for (let i = 0; i < 200; i++) {
    const mid = (lo + hi) / 2;
    if (mid - e * Math.sin(mid) < M) lo = mid;
    else hi = mid;
  }
  const E = (lo + hi) / 2;
  const f = 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(E / 2), Math.sqrt(1 - e) * Math.cos(E / 2));
  const r = (aR * (1 - e * e)) / (1 + e * Math.cos(f));
  const X = -r * Math.cos(w + f);
  const Y = -r * Math.sin(w + f) * Math.cos(inc);
  const Z = r * Math.sin(w + f) * Math.sin(inc);
  return { z: Math.hypot(X, Y), Z };
}

const ORBITS: { name: string; orbit: TransitOrbit }[] = [
  { name: 'circular, b = 0.3', orbit: { period: 3.2, tc: 0.4, scaledSemiMajorAxis: 9.5, impactParameter: 0.3 } },
  { name: 'eccentric, b = 0.5', orbit: { period: 11.7, tc: -2.1, eccentricity: 0.35, omega: 1.1, scaledSemiMajorAxis: 21, impactParameter: 0.5 } },
  { name: 'eccentric, inclination', orbit: { period: 7.3, tc: 1.2, eccentricity: 0.6, omega: -2.4, scaledSemiMajorAxis: 15, inclination: 1.53 } },
  { name: 'high e, retrograde-looking i > 90°', orbit: { period: 40, tc: 5, eccentricity: 0.9, omega: 0.3, scaledSemiMajorAxis: 60, inclination: 1.6 } },
];

function inclinationOf(o: TransitOrbit): number {
  return o.inclination ?? inclinationFromImpact(o.impactParameter as number, o.scaledSemiMajorAxis, o.eccentricity ?? 0, o.omega ?? 0);
}

describe('sky-projected separation', () => {
  it('equals Winn (2010) eqs. 2-4 evaluated independently, at many times', () => {
    for (const { name, orbit } of ORBITS) {
      const ref = {
        period: orbit.period,
        tc: orbit.tc,
        eccentricity: orbit.eccentricity ?? 0,
        omega: orbit.omega ?? 0,
        scaledSemiMajorAxis: orbit.scaledSemiMajorAxis,
        inclination: inclinationOf(orbit),
      };
      for (let j = 0; j < 60; j++) {
        const t = orbit.tc + ((j + 0.37) / 60 - 0.3) * 2.5 * orbit.period;
        const got = skySeparation(t, orbit);
        const want = winnPosition(t, ref);
        expect(Math.abs(got.z - want.z) / ref.scaledSemiMajorAxis, `${name} t=${t}`).toBeLessThan(1e-12);
        expect(got.inFront, `${name} t=${t}`).toBe(want.Z > 0);
      }
    }
  });

  it('stays at rounding level near conjunction, where Kepler’s equation is solved by series, for e up to 0.97', () => {
    for (const e of [0, 0.1, 0.5, 0.9, 0.97]) {
      for (const w of [-2.5, -0.3, 0.9, 2.2]) {
        const orbit = { period: 5, tc: 0.2, eccentricity: e, omega: w, scaledSemiMajorAxis: 30, inclination: 1.5 };
        for (let j = 0; j <= 80; j++) {
          // Mean-anomaly offsets up to ±0.6 rad, the range where the series applies.
          const t = orbit.tc + ((j / 80 - 0.5) * 1.2 * orbit.period) / (2 * Math.PI) + 7 * orbit.period;
          const got = skySeparation(t, orbit).z;
          const want = winnPosition(t, orbit).z;
          expect(Math.abs(got - want), `e=${e} w=${w} t=${t}`).toBeLessThan(3e-14 * orbit.scaledSemiMajorAxis);
        }
      }
    }
  });

  it('is the impact parameter at conjunction (Winn 2010, eq. 7)', () => {
    for (const { orbit } of ORBITS) {
      const b = orbit.impactParameter ?? impactFromInclination(orbit.inclination as number, orbit.scaledSemiMajorAxis, orbit.eccentricity ?? 0, orbit.omega ?? 0);
      const at = skySeparation(orbit.tc, orbit);
      expect(at.inFront).toBe(true);
      expect(Math.abs(at.z - Math.abs(b))).toBeLessThan(1e-12 * orbit.scaledSemiMajorAxis);
    }
  });

  it('circular orbit: z = (a/R_*) √(sin²φ + cos²i cos²φ), φ = 2π(t - tc)/P (common practice)', () => {
    const orbit: TransitOrbit = { period: 2.5, tc: 0, scaledSemiMajorAxis: 7, inclination: 1.45 };
    for (const t of [0, 0.05, 0.3, 0.9, 1.25, 2.0]) {
      const phi = (2 * Math.PI * t) / 2.5;
      const want = 7 * Math.sqrt(Math.sin(phi) ** 2 + Math.cos(1.45) ** 2 * Math.cos(phi) ** 2);
      expect(Math.abs(skySeparation(t, orbit).z - want)).toBeLessThan(1e-13);
    }
  });

  it('has no false transit at opposition: behind the star near the other conjunction', () => {
    // Eccentric, nearly edge-on orbit: at f = 3π/2 - ω the planet is projected on the
    // disk (z < 1) but behind the star (Z < 0).
    const orbit: TransitOrbit = { period: 9, tc: 0, eccentricity: 0.4, omega: 0.7, scaledSemiMajorAxis: 12, inclination: Math.PI / 2 - 0.01 };
    const e = 0.4;
    const w = 0.7;
    const meanOf = (f: number) => {
      const E = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(f / 2));
      return E - e * Math.sin(E);
    };
    let dM = meanOf(1.5 * Math.PI - w) - meanOf(Math.PI / 2 - w);
    dM -= 2 * Math.PI * Math.floor(dM / (2 * Math.PI));
    const tOpp = (dM / (2 * Math.PI)) * 9;
    const opp = skySeparation(tOpp, orbit);
    expect(opp.z).toBeLessThan(1);
    expect(opp.inFront).toBe(false);
    expect(skySeparation(0, orbit).inFront).toBe(true);
    // The light curve is flat there and dips at the transit.
    const kernel = createLightCurveKernel({ times: Float64Array.from([tOpp - 0.01, tOpp, tOpp + 0.01, 0]), planets: 1, angle: 'inclination' });
    const flux = kernel.flux(Float64Array.from([9, 0, 0.4, 0.7, 12, Math.PI / 2 - 0.01, 0.1, 0.4, 0.2]));
    expect(Array.from(flux.subarray(0, 3))).toEqual([1, 1, 1]);
    expect(flux[3]).toBeLessThan(0.99);
  });

  it('partials agree with float64 central differences (circular and eccentric, b or i)', () => {
    const out = new Float64Array(7);
    const keys = ['period', 'tc', 'eccentricity', 'omega', 'scaledSemiMajorAxis'] as const;
    for (const { name, orbit } of ORBITS) {
      const angleKey: 'impactParameter' | 'inclination' = orbit.impactParameter !== undefined ? 'impactParameter' : 'inclination';
      const base: TransitOrbit = { eccentricity: 0.1, omega: 0.4, ...orbit };
      for (const dt of [-0.07, -0.01, 0.003, 0.05, 0.21 * orbit.period]) {
        const t = orbit.tc + dt;
        skySeparationWithPartials(t, base, out);
        const slots: (keyof TransitOrbit)[] = [...keys, angleKey];
        slots.forEach((key, s) => {
          const h = 1e-6 * Math.max(1, Math.abs(base[key] as number));
          const plus = skySeparation(t, { ...base, [key]: (base[key] as number) + h }).z;
          const minus = skySeparation(t, { ...base, [key]: (base[key] as number) - h }).z;
          const fd = (plus - minus) / (2 * h);
          expect(Math.abs(out[s + 1] - fd), `${name} dt=${dt} ${key}`).toBeLessThan(2e-6 * Math.max(1, Math.abs(fd)));
        });
      }
    }
  });

  it('rejects an unreachable impact parameter and a missing angle, naming the field', () => {
    expect(() => skySeparation(0, { period: 1, tc: 0, scaledSemiMajorAxis: 3, impactParameter: 3.5 })).toThrow(/impactParameter/);
    expect(() => skySeparation(0, { period: 1, tc: 0, scaledSemiMajorAxis: 3 })).toThrow(TransitParameterError);
    expect(() => skySeparation(0, { period: -1, tc: 0, scaledSemiMajorAxis: 3, impactParameter: 0 })).toThrow(/period/);
    expect(() => skySeparation(Number.NaN, { period: 1, tc: 0, scaledSemiMajorAxis: 3, impactParameter: 0 })).toThrow(/time = NaN/);
  });
});

describe('parametrisation conversions', () => {
  it('b and inclination convert both ways (Winn 2010, eq. 7)', () => {
    for (const [b, aR, e, w] of [
      [0.3, 10, 0, 0],
      [0.8, 25, 0.4, 2.1],
      [-0.2, 5, 0.7, -1],
    ]) {
      const inc = inclinationFromImpact(b, aR, e, w);
      expect(Math.abs(impactFromInclination(inc, aR, e, w) - b)).toBeLessThan(1e-13);
      expect(Math.abs(aR * Math.cos(inc) * ((1 - e * e) / (1 + e * Math.sin(w))) - b)).toBeLessThan(1e-13);
    }
  });

  it('an Earth analogue’s a/R_* and period give the solar mean density (Kepler’s third law, common practice)', () => {
    // a/R_sun from the nominal au and solar radius (IAU 2012 B2, IAU 2015 B3); the
    // sidereal year 365.256363 d (from memory). rho_sun = 3 M_sun/(4 pi R_sun³).
    const aR = AU_M / SOLAR_RADIUS_M;
    const P = 365.256363;
    const rhoSun = (3 * (SOLAR_GM / GRAVITATIONAL_CONSTANT)) / (4 * Math.PI * SOLAR_RADIUS_M ** 3);
    const rho = stellarDensityFromScaledSemiMajorAxis(aR, P);
    // Earth's mass (3e-6 M_sun) and the au not being exactly Earth's Keplerian axis
    // leave a difference of order 1e-5.
    expect(Math.abs(rho / rhoSun - 1)).toBeLessThan(1e-4);
    expect(Math.abs(scaledSemiMajorAxisFromDensity(rho, P) / aR - 1)).toBeLessThan(1e-14);
  });

  it('a/R_* from density has the partials of a power law', () => {
    const out = new Float64Array(3);
    scaledSemiMajorAxisFromDensityPartials(1400, 4.2, out);
    const h = 1e-4;
    const dRho = (scaledSemiMajorAxisFromDensity(1400 * (1 + h), 4.2) - scaledSemiMajorAxisFromDensity(1400 * (1 - h), 4.2)) / (2 * 1400 * h);
    const dP = (scaledSemiMajorAxisFromDensity(1400, 4.2 * (1 + h)) - scaledSemiMajorAxisFromDensity(1400, 4.2 * (1 - h))) / (2 * 4.2 * h);
    expect(Math.abs(out[1] / dRho - 1)).toBeLessThan(1e-8);
    expect(Math.abs(out[2] / dP - 1)).toBeLessThan(1e-8);
  });
});

describe('transit durations (Winn 2010, eqs. 14-16)', () => {
  it('an Earth analogue’s central transit lasts about 13 h (common practice)', () => {
    const k = 6.3781e6 / SOLAR_RADIUS_M;
    const d = transitDurations({ period: 365.256363, scaledSemiMajorAxis: AU_M / SOLAR_RADIUS_M, radiusRatio: k, impactParameter: 0 });
    expect(Math.abs(d.total * 24 - 13)).toBeLessThan(0.2);
    expect(d.full).toBeLessThan(d.total);
  });

  it('equals the time between contacts found by root finding on z(t) for a circular orbit', () => {
    const orbit: TransitOrbit = { period: 4.1, tc: 0, scaledSemiMajorAxis: 8, impactParameter: 0.4 };
    const k = 0.12;
    const contact = (level: number): number => {
      let lo = 0;
      let hi = 0.3;
      for (let i = 0; i < 200; i++) {
        const mid = (lo + hi) / 2;
        if (skySeparation(mid, orbit).z < level) lo = mid;
        else hi = mid;
      }
      return (lo + hi) / 2;
    };
    const d = transitDurations({ period: 4.1, scaledSemiMajorAxis: 8, radiusRatio: k, impactParameter: 0.4 });
    // Eq. 14 is exact for circular orbits (symmetric contacts about tc).
    expect(Math.abs(d.total - 2 * contact(1 + k))).toBeLessThan(1e-12);
    expect(Math.abs(d.full - 2 * contact(1 - k))).toBeLessThan(1e-12);
  });

  it('for an eccentric orbit the Winn (2010) eq. 16 factor is close to the true duration', () => {
    const orbit: TransitOrbit = { period: 20, tc: 0, eccentricity: 0.3, omega: 0.9, scaledSemiMajorAxis: 30, impactParameter: 0.2 };
    const k = 0.1;
    const crossing = (a: number, b: number): number => {
      for (let i = 0; i < 200; i++) {
        const mid = (a + b) / 2;
        if (skySeparation(mid, orbit).z < 1 + k === skySeparation(a, orbit).z < 1 + k) a = mid;
        else b = mid;
      }
      return (a + b) / 2;
    };
    const numeric = crossing(0, 1) - crossing(0, -1);
    const d = transitDurations({ period: 20, scaledSemiMajorAxis: 30, radiusRatio: k, impactParameter: 0.2, eccentricity: 0.3, omega: 0.9 });
    expect(Math.abs(d.total / numeric - 1)).toBeLessThan(0.01);
  });

  it('gives zero full duration for a grazing transit and rejects b with i', () => {
    const d = transitDurations({ period: 3, scaledSemiMajorAxis: 8, radiusRatio: 0.1, impactParameter: 0.95 });
    expect(d.full).toBe(0);
    expect(d.total).toBeGreaterThan(0);
    expect(() => transitDurations({ period: 3, scaledSemiMajorAxis: 8, radiusRatio: 0.1, impactParameter: 0.5, inclination: 1.5 })).toThrow(TransitParameterError);
    expect(() => transitDurations({ period: 3, scaledSemiMajorAxis: 0.5, radiusRatio: 0.1, impactParameter: 0.5 })).toThrow(/scaledSemiMajorAxis/);
  });
});

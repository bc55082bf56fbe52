import { describe, expect, it } from 'vitest';
import {
  AU_M,
  EARTH_MASS_IN_SOLAR,
  JUPITER_MASS_IN_SOLAR,
  OrbitParameterError,
  ROOT_ECCENTRICITY_LOG_JACOBIAN,
  conjunctionMeanAnomaly,
  conjunctionMeanAnomalyPartialsInto,
  conjunctionTimeFromPeriastron,
  eccentricFromTrueAnomaly,
  meanFromEccentricAnomaly,
  periastronTimeFromConjunction,
  planetMassFromSemiAmplitude,
  polarFromRootEccentricity,
  rootEccentricityGradient,
  rootEccentricityJacobian,
  rootFromPolarEccentricity,
  semiAmplitude,
  semiMajorAxisAu,
  separationOverA,
  solveKepler,
  trueAnomalyFromEccentric,
  trueFromMeanAnomaly,
} from '../src/orbit/index.js';

const TWO_PI = 2 * Math.PI;
/** Angle difference reduced to (-pi, pi]. */
const angleDiff = (a: number, b: number): number => {
  const d = a - b;
  return d - TWO_PI * Math.round(d / TWO_PI);
};

describe('anomalies and separation', () => {
  it('true anomaly satisfies cos f = (cos E - e)/(1 - e cos E) and r/a = (1 - e^2)/(1 + e cos f)', () => {
    // Standard ellipse relations (e.g. Murray & Dermott 1999, Solar System Dynamics, ch. 2; from memory).
    for (const e of [0, 0.2, 0.7, 0.999]) {
      for (const E of [-4, -1, 0, 0.3, 2, 3.1, 9]) {
        const f = trueAnomalyFromEccentric(E, e);
        expect(Math.abs(Math.cos(f) - (Math.cos(E) - e) / (1 - e * Math.cos(E)))).toBeLessThan(1e-12);
        // sin f has the sign of sin E (the same half of the orbit).
        expect(Math.sign(Math.sin(f)) * Math.sign(Math.sin(E))).toBeGreaterThanOrEqual(0);
        const r = separationOverA(E, e);
        expect(Math.abs(r - (1 - e * e) / (1 + e * Math.cos(f)))).toBeLessThan(1e-12);
        // Round trip f -> E keeps the turn count.
        expect(Math.abs(eccentricFromTrueAnomaly(f, e) - E)).toBeLessThan(1e-12);
      }
    }
  });

  it('true anomaly from mean anomaly goes through periastron (f = 0 at M = 0) and apoastron (f = pi at M = pi)', () => {
    // Geometry of the ellipse (common practice).
    expect(trueFromMeanAnomaly(0, 0.6)).toBe(0);
    expect(Math.abs(trueFromMeanAnomaly(Math.PI, 0.6) - Math.PI)).toBeLessThan(1e-14);
    // Equal areas: the planet spends less than half the period on the periastron side.
    const fQuarter = trueFromMeanAnomaly(Math.PI / 2, 0.6);
    expect(fQuarter).toBeGreaterThan(Math.PI / 2);
  });

  it('the mean anomaly at conjunction puts the planet at f = pi/2 - omega', () => {
    // Winn (2010), "Transits and Occultations": inferior conjunction at f = pi/2 - omega.
    for (const e of [0, 0.1, 0.5, 0.95]) {
      for (const w of [-3, -Math.PI / 2, 0, 1, 2.5, 7]) {
        const Mc = conjunctionMeanAnomaly(e, w);
        expect(Mc).toBeGreaterThan(-Math.PI - 1e-12);
        expect(Mc).toBeLessThanOrEqual(Math.PI + 1e-12);
        const f = trueFromMeanAnomaly(Mc, e);
        expect(Math.abs(angleDiff(f, Math.PI / 2 - w))).toBeLessThan(1e-10);
      }
    }
    // Circular orbit: mean and true anomaly coincide, so M_c = pi/2 - omega itself.
    expect(conjunctionMeanAnomaly(0, 1.3)).toBeCloseTo(Math.PI / 2 - 1.3, 15);
  });

  it('conjunction mean anomaly partials match central differences', () => {
    const out = new Float64Array(2);
    for (const e of [0, 1e-8, 0.3, 0.95]) {
      for (const w of [-2.5, -0.3, 0.4, 1.9, 3]) {
        conjunctionMeanAnomalyPartialsInto(e, w, out, 0);
        const h = 1e-6;
        const dw = (conjunctionMeanAnomaly(e, w + h) - conjunctionMeanAnomaly(e, w - h)) / (2 * h);
        expect(Math.abs(out[1] - dw)).toBeLessThan(1e-6 * Math.max(1, Math.abs(dw)));
        const he = Math.min(1e-6, e / 2 || 1e-7);
        const de =
          e === 0
            ? (-3 * conjunctionMeanAnomaly(0, w) + 4 * conjunctionMeanAnomaly(he, w) - conjunctionMeanAnomaly(2 * he, w)) / (2 * he)
            : (conjunctionMeanAnomaly(e + he, w) - conjunctionMeanAnomaly(e - he, w)) / (2 * he);
        expect(Math.abs(out[0] - de)).toBeLessThan(1e-5 * Math.max(1, Math.abs(de)));
      }
    }
  });
});

describe('time of periastron and time of conjunction', () => {
  it('round-trips and puts the planet at periastron (M = 0) at tp', () => {
    for (const e of [0, 0.2, 0.9]) {
      for (const w of [-2, 0.5, 3]) {
        const orbit = { period: 17.3, eccentricity: e, omega: w };
        const tc = 1234.5678;
        const tp = periastronTimeFromConjunction(tc, orbit);
        expect(Math.abs(conjunctionTimeFromPeriastron(tp, orbit) - tc)).toBeLessThan(1e-10);
        expect(Math.abs(tp - tc)).toBeLessThanOrEqual(orbit.period / 2 + 1e-12);
        // M(t) = 2 pi (t - tc)/P + M_c vanishes at tp (definition of periastron passage).
        const Mtp = (TWO_PI * (tp - tc)) / orbit.period + conjunctionMeanAnomaly(e, w);
        expect(Math.abs(Mtp)).toBeLessThan(1e-12);
        // f at tp is 0 up to the rounding of M amplified by df/dM = sqrt((1 + e)/(1 - e)^3).
        expect(Math.abs(trueFromMeanAnomaly(Mtp, e))).toBeLessThan(1e-12 * Math.sqrt((1 + e) / (1 - e) ** 3));
      }
    }
    // Circular orbit: the reference "periastron" is where M = f = 0, a quarter period
    // before conjunction when omega = 0 (f_c = pi/2).
    expect(periastronTimeFromConjunction(10, { period: 3, eccentricity: 0, omega: 0 })).toBeCloseTo(10 - 0.75, 14);
  });

  it('rejects bad orbits by field', () => {
    expect(() => periastronTimeFromConjunction(0, { period: -1, eccentricity: 0.1, omega: 0 })).toThrow(/period = -1/);
    expect(() => periastronTimeFromConjunction(0, { period: 1, eccentricity: 1, omega: 0 })).toThrow(/eccentricity = 1/);
    expect(() => conjunctionTimeFromPeriastron(Number.NaN, { period: 1, eccentricity: 0, omega: 0 })).toThrow(OrbitParameterError);
  });
});

describe('root eccentricity form (sqrt(e) cos omega, sqrt(e) sin omega)', () => {
  it('round-trips and has Jacobian determinant 2 (checked by finite differences)', () => {
    for (const [e, w] of [
      [0.3, 1.1],
      [0.9, -2.4],
      [1e-6, 0.2],
    ]) {
      const { h, k } = rootFromPolarEccentricity(e, w);
      const back = polarFromRootEccentricity(h, k);
      expect(Math.abs(back.eccentricity - e)).toBeLessThan(1e-15);
      expect(Math.abs(angleDiff(back.omega, w))).toBeLessThan(1e-9);
      const J = rootEccentricityJacobian(h, k);
      const d = 1e-7 * Math.sqrt(e);
      const num = (dh: number, dk: number) => polarFromRootEccentricity(h + dh, k + dk);
      const eH = (num(d, 0).eccentricity - num(-d, 0).eccentricity) / (2 * d);
      const wK = angleDiff(num(0, d).omega, num(0, -d).omega) / (2 * d);
      expect(Math.abs(J[0] - eH)).toBeLessThan(1e-6);
      expect(Math.abs(J[3] - wK) / Math.abs(wK)).toBeLessThan(1e-6);
      // det = 2 h (h/e) + 2 k (k/e) = 2 (change of variables, standard calculus).
      expect(Math.abs(J[0] * J[3] - J[1] * J[2] - 2)).toBeLessThan(1e-9);
    }
    expect(ROOT_ECCENTRICITY_LOG_JACOBIAN).toBeCloseTo(Math.log(2), 15);
    expect(polarFromRootEccentricity(0, 0)).toEqual({ eccentricity: 0, omega: 0 });
    expect(() => polarFromRootEccentricity(0.8, 0.7)).toThrow(/below 1/);
  });

  it('chains a gradient from (e, omega) to (h, k) as finite differences do', () => {
    // A smooth test function of (e, omega) whose omega-derivative vanishes like e at e = 0.
    const L = (e: number, w: number) => Math.sin(3 * e) + e * Math.cos(w) * 0.7 + e * e * Math.sin(2 * w);
    const h = 0.31;
    const k = -0.42;
    const { eccentricity: e, omega: w } = polarFromRootEccentricity(h, k);
    const dLde = 3 * Math.cos(3 * e) + 0.7 * Math.cos(w) + 2 * e * Math.sin(2 * w);
    const dLdwOverE = -0.7 * Math.sin(w) + 2 * e * Math.cos(2 * w);
    const out = new Float64Array(2);
    rootEccentricityGradient(h, k, dLde, dLdwOverE, out, 0);
    const f = (a: number, b: number) => {
      const p = polarFromRootEccentricity(a, b);
      return L(p.eccentricity, p.omega);
    };
    const d = 1e-6;
    expect(Math.abs(out[0] - (f(h + d, k) - f(h - d, k)) / (2 * d))).toBeLessThan(1e-8);
    expect(Math.abs(out[1] - (f(h, k + d) - f(h, k - d)) / (2 * d))).toBeLessThan(1e-8);
  });
});

describe('semi-amplitude, planet mass, semi-major axis', () => {
  it('a Jupiter analogue gives about 12.5 m/s and an Earth analogue about 0.09 m/s', () => {
    // K formula: Lovis & Fischer (2010), in "Exoplanets" (ed. Seager), eq. 1 (from memory).
    // Check values: common practice. Jupiter: P = 4332.59 d, e = 0.0489 (from memory).
    const kJup = semiAmplitude({ period: 4332.59, eccentricity: 0.0489, planetMass: JUPITER_MASS_IN_SOLAR, starMass: 1 });
    expect(kJup).toBeGreaterThan(12.4);
    expect(kJup).toBeLessThan(12.6);
    const kEarth = semiAmplitude({ period: 365.256, eccentricity: 0.0167, planetMass: EARTH_MASS_IN_SOLAR, starMass: 1 });
    expect(kEarth).toBeGreaterThan(0.085);
    expect(kEarth).toBeLessThan(0.095);
    // Inclination enters as sin i.
    const kTilted = semiAmplitude({ period: 4332.59, eccentricity: 0.0489, planetMass: JUPITER_MASS_IN_SOLAR, starMass: 1, inclination: Math.PI / 6 });
    expect(kTilted / kJup).toBeCloseTo(0.5, 12);
  });

  it('the inverse recovers the mass, including a massive companion', () => {
    for (const [m, P, e, Ms, inc] of [
      [JUPITER_MASS_IN_SOLAR, 4332.59, 0.0489, 1, Math.PI / 2],
      [EARTH_MASS_IN_SOLAR, 365.256, 0.0167, 1, Math.PI / 2],
      [0.05, 12.3, 0.6, 0.4, 1.0],
      [0.3, 40, 0.1, 0.8, 2.0],
    ]) {
      const K = semiAmplitude({ period: P, eccentricity: e, planetMass: m, starMass: Ms, inclination: inc });
      const back = planetMassFromSemiAmplitude({ semiAmplitude: K, period: P, eccentricity: e, starMass: Ms, inclination: inc });
      expect(Math.abs(back - m) / m).toBeLessThan(1e-12);
    }
    // Minimum mass (sin i = 1) of a tilted orbit's K is m sin i only when m << M_*.
    const K = semiAmplitude({ period: 10, eccentricity: 0, planetMass: JUPITER_MASS_IN_SOLAR, starMass: 1, inclination: Math.PI / 3 });
    const msini = planetMassFromSemiAmplitude({ semiAmplitude: K, period: 10, eccentricity: 0, starMass: 1 });
    expect(Math.abs(msini / (JUPITER_MASS_IN_SOLAR * Math.sin(Math.PI / 3)) - 1)).toBeLessThan(1e-3);
  });

  it("Kepler's third law gives 1 au for one year around one solar mass and about 5.2 au for Jupiter", () => {
    // Kepler's third law; 1 au and 365.256 d for the Earth, 5.20 au for Jupiter (common practice).
    expect(semiMajorAxisAu({ period: 365.256363, starMass: 1, planetMass: EARTH_MASS_IN_SOLAR })).toBeCloseTo(1, 4);
    expect(semiMajorAxisAu({ period: 4332.59, starMass: 1, planetMass: JUPITER_MASS_IN_SOLAR })).toBeCloseTo(5.2, 1);
    expect(AU_M).toBe(149597870700);
  });

  it('rejects non-physical inputs by field', () => {
    expect(() => semiAmplitude({ period: 0, eccentricity: 0, planetMass: 1e-3, starMass: 1 })).toThrow(/period = 0/);
    expect(() => semiAmplitude({ period: 1, eccentricity: 1, planetMass: 1e-3, starMass: 1 })).toThrow(/eccentricity/);
    expect(() => planetMassFromSemiAmplitude({ semiAmplitude: -3, period: 1, eccentricity: 0, starMass: 1 })).toThrow(/semiAmplitude = -3/);
  });
});

describe('conventions', () => {
  it('mean anomaly from eccentric anomaly inverts the solver', () => {
    for (const e of [0, 0.5, 0.99]) expect(Math.abs(meanFromEccentricAnomaly(solveKepler(2.2, e), e) - 2.2)).toBeLessThan(1e-14);
  });
});

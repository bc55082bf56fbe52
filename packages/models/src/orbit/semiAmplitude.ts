/**
 * Radial-velocity semi-amplitude, planet mass and semi-major axis from Kepler's third
 * law. Masses are in nominal solar masses (through GM_sun, IAU 2015 Resolution B3,
 * exact by definition, so no uncertainty of G enters); use `JUPITER_MASS_IN_SOLAR` and
 * `EARTH_MASS_IN_SOLAR` from `constants.ts` for planetary units. Periods in days,
 * velocities in m/s, inclinations in radians, lengths in metres.
 */
import { z } from 'zod';
import { AU_M, SECONDS_PER_DAY, SOLAR_GM } from './constants.js';
import { OrbitParameterError } from './errors.js';

const positive = z.number().finite().positive();
const eccentricity = z.number().min(0).lt(1);
const inclination = z.number().gt(0).lt(Math.PI);

function parse<T extends z.ZodRawShape>(shape: T, input: Record<string, unknown>, expected: Record<string, string>): void {
  const r = z.object(shape).safeParse(input);
  if (!r.success) {
    const field = String(r.error.issues[0].path[0] ?? 'input');
    throw new OrbitParameterError(field, input[field], expected[field] ?? r.error.issues[0].message);
  }
}

const EXPECTED: Record<string, string> = {
  period: 'a finite positive number (days)',
  eccentricity: 'a number in [0, 1)',
  planetMass: 'a finite positive number (solar masses)',
  starMass: 'a finite positive number (solar masses)',
  semiAmplitude: 'a finite positive number (m/s)',
  inclination: 'a number in (0, pi) radians',
};

/** Inputs of {@link semiAmplitude}. */
export interface SemiAmplitudeInput {
  /** Orbital period, days. */
  period: number;
  /** Eccentricity, 0 <= e < 1. */
  eccentricity: number;
  /** Planet mass, nominal solar masses. */
  planetMass: number;
  /** Stellar mass, nominal solar masses. */
  starMass: number;
  /** Orbital inclination, radians (default pi/2, edge-on). */
  inclination?: number;
}

/**
 * Stellar radial-velocity semi-amplitude K (m/s):
 * K = (2 pi G / P)^(1/3) m_p sin i / (M_* + m_p)^(2/3) / sqrt(1 - e^2)
 * (Lovis & Fischer 2010, in "Exoplanets", ed. Seager, eq. 1), with G M = GM_sun x mass.
 */
export function semiAmplitude(input: SemiAmplitudeInput): number {
  parse(
    { period: positive, eccentricity, planetMass: positive, starMass: positive, inclination: inclination.optional() },
    input as unknown as Record<string, unknown>,
    EXPECTED,
  );
  const { period, eccentricity: e, planetMass, starMass } = input;
  const sinI = Math.sin(input.inclination ?? Math.PI / 2);
  const P = period * SECONDS_PER_DAY;
  return (
    (Math.cbrt((2 * Math.PI * SOLAR_GM) / P) * planetMass * sinI) /
    Math.pow(starMass + planetMass, 2 / 3) /
    Math.sqrt(1 - e * e)
  );
}

/** Inputs of {@link planetMassFromSemiAmplitude}. */
export interface PlanetMassInput {
  /** Semi-amplitude K, m/s. */
  semiAmplitude: number;
  /** Orbital period, days. */
  period: number;
  /** Eccentricity, 0 <= e < 1. */
  eccentricity: number;
  /** Stellar mass, nominal solar masses. */
  starMass: number;
  /**
   * Orbital inclination, radians. Default pi/2, which makes the result the minimum
   * mass m sin i (with the planet's own mass kept in the total mass).
   */
  inclination?: number;
}

/**
 * Planet mass (nominal solar masses) from the semi-amplitude: solves
 * (m sin i)^3 / (M_* + m)^2 = P K^3 (1 - e^2)^(3/2) / (2 pi G) (the mass function,
 * the inverse of {@link semiAmplitude}) for m by Newton's method on
 * g(m) = 3 ln(m sin i) - 2 ln(M_* + m) - ln f, which is increasing and concave in ln m,
 * started from the small-planet value m0 = (f M_*^2)^(1/3) / sin i.
 * With the default inclination this is the minimum mass m sin i.
 */
export function planetMassFromSemiAmplitude(input: PlanetMassInput): number {
  parse(
    { semiAmplitude: positive, period: positive, eccentricity, starMass: positive, inclination: inclination.optional() },
    input as unknown as Record<string, unknown>,
    EXPECTED,
  );
  const { semiAmplitude: K, period, eccentricity: e, starMass: M } = input;
  const sinI = Math.sin(input.inclination ?? Math.PI / 2);
  const P = period * SECONDS_PER_DAY;
  const massFunction = (P * K * K * K * Math.pow(1 - e * e, 1.5)) / (2 * Math.PI * SOLAR_GM); // solar masses
  const logF = Math.log(massFunction);
  // Newton in x = ln m: g(x) = 3 x + 3 ln sin i - 2 ln(M + e^x) - ln f,
  // g'(x) = 3 - 2 m / (M + m) > 1, so the iteration converges from m0 upward.
  let x = Math.log(Math.cbrt(massFunction * M * M) / sinI);
  for (let it = 0; it < 60; it++) {
    const m = Math.exp(x);
    const g = 3 * x + 3 * Math.log(sinI) - 2 * Math.log(M + m) - logF;
    const dg = 3 - (2 * m) / (M + m);
    const step = g / dg;
    x -= step;
    if (Math.abs(step) < 1e-15) break;
  }
  return Math.exp(x);
}

/** Inputs of {@link semiMajorAxis}. */
export interface SemiMajorAxisInput {
  /** Orbital period, days. */
  period: number;
  /** Stellar mass, nominal solar masses. */
  starMass: number;
  /** Planet mass, nominal solar masses (default 0). */
  planetMass?: number;
}

/**
 * Relative semi-major axis (metres) by Kepler's third law:
 * a = [G (M_* + m_p) P^2 / (4 pi^2)]^(1/3). Divide by `AU_M` for astronomical units.
 */
export function semiMajorAxis(input: SemiMajorAxisInput): number {
  parse(
    { period: positive, starMass: positive, planetMass: z.number().finite().min(0).optional() },
    input as unknown as Record<string, unknown>,
    { ...EXPECTED, planetMass: 'a finite non-negative number (solar masses)' },
  );
  const P = input.period * SECONDS_PER_DAY;
  const GM = SOLAR_GM * (input.starMass + (input.planetMass ?? 0));
  return Math.cbrt((GM * P * P) / (4 * Math.PI * Math.PI));
}

/** Semi-major axis in astronomical units (IAU 2012 au); see {@link semiMajorAxis}. */
export function semiMajorAxisAu(input: SemiMajorAxisInput): number {
  return semiMajorAxis(input) / AU_M;
}

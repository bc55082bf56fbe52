/**
 * Invented data sets for the builder tests: a star with two planets seen by two
 * spectrographs (labels `north`, `south`) and, for transits, one or two photometers.
 * Everything is simulated from stated true values with a seeded random stream.
 */
import { createRandomStream } from '@apsis/core';
import {
  simulateLightCurve,
  simulateRadialVelocities,
  type LightCurveInput,
  type RvDataInput,
  type SimulatedPlanet,
} from '../src/index.js';

/** Time origin of the invented data sets (days). */
export const ORIGIN = 2460000;

/** True values of the two-planet system (angles in degrees, as in the builders). */
export const twoPlanets: readonly SimulatedPlanet[] = [
  { period: 4.2317, tc: ORIGIN + 1.37, eccentricity: 0.12, omega: 65, semiAmplitude: 28, radiusRatio: 0.085, impactParameter: 0.35 },
  { period: 21.9, tc: ORIGIN + 8.4, eccentricity: 0.28, omega: -120, semiAmplitude: 11, radiusRatio: 0.05, impactParameter: 0.2 },
];
export const rvTruth = { offsets: { north: -12.5, south: 31.0 }, jitters: { north: 1.8, south: 3.2 } };
export const starTruth = { density: 1.9 };
export const lightCurveTruth = { u1: 0.42, u2: 0.22, baseline: 1.0003, jitter: 2e-4 };

/** Times spread irregularly over `span` days, `n` points, from a seeded stream. */
export function irregularTimes(n: number, span: number, seed: string): number[] {
  const s = createRandomStream(seed);
  return Array.from({ length: n }, () => ORIGIN + span * s.uniform()).sort((a, b) => a - b);
}

/** Radial velocities of both planets from both instruments. */
export function rvData(n: number, seed: string, span = 400): RvDataInput {
  const times = irregularTimes(n, span, `${seed}-times`);
  const s = createRandomStream(seed);
  const instrument = times.map((_, i) => (i % 3 === 2 ? 'south' : 'north'));
  const errors = times.map((_, i) => (instrument[i] === 'north' ? 1.5 : 2.5));
  return simulateRadialVelocities({ times, instrument, errors, planets: twoPlanets, ...rvTruth }, s).data;
}

/** Times within ±`half` days of each transit of `planet`, at a fixed cadence (days), over `span` days. */
export function transitWindows(planet: SimulatedPlanet, span: number, cadence: number, half: number): number[] {
  const out: number[] = [];
  for (let t = ORIGIN; t < ORIGIN + span; t += cadence) {
    const d = t - planet.tc - planet.period * Math.round((t - planet.tc) / planet.period);
    if (Math.abs(d) < half) out.push(t);
  }
  return out;
}

/** A light curve of the given planets (10-minute exposures by default). */
export function lightCurve(
  label: string,
  planets: readonly SimulatedPlanet[],
  times: readonly number[],
  seed: string,
  extra: { exposureTime?: number; errors?: number; dilution?: number; band?: string } = {},
): LightCurveInput {
  return simulateLightCurve(
    {
      label,
      times,
      errors: extra.errors ?? 6e-4,
      exposureTime: extra.exposureTime ?? 10 / 1440,
      planets,
      starDensity: starTruth.density,
      ...lightCurveTruth,
      ...(extra.dilution !== undefined ? { dilution: extra.dilution } : {}),
      ...(extra.band !== undefined ? { band: extra.band } : {}),
    },
    createRandomStream(seed),
  ).data;
}

/**
 * Invented benchmark scenarios for the shipped model builders of @apsis/models, with data
 * simulated by the builders' own simulation helpers from a seeded stream. The exported
 * async factories take JSON arguments, so they double as worker-thread recipes
 * ({ module: this file, exportName, args }).
 *
 * - `jointScenario`: one transiting planet seen in radial velocities (one instrument) and
 *   in a light curve (2-minute exposures, evenly spread over 40 days, so the fraction of
 *   points in transit, about 3%, does not depend on N).
 * - `rvScenario`: two eccentric planets in radial velocities from two instruments over
 *   400 days.
 * - `transitScenario`: two transiting planets on circular orbits in one light curve
 *   (2-minute exposures, evenly spread over 40 days: about 5% of the points in a
 *   transit, whatever N).
 */
import { createRandomStream } from '@apsis/core';
import {
  createJointModel,
  createRvModel,
  createTransitModel,
  simulateLightCurve,
  simulateRadialVelocities,
  type PlanetSystemModel,
} from '@apsis/models';

/** Reference time of the invented data sets, days (a BJD-like value, to exercise float64 times). */
const ORIGIN = 2461000;

export interface JointScenarioArgs {
  /** Light-curve points (default 2000). */
  lightCurvePoints?: number;
  /** Radial velocities (default max(20, lightCurvePoints / 40)). */
  rvPoints?: number;
  /** Search the posterior mode at build time (builders' default true). */
  searchMode?: boolean;
  seed?: string;
}

export interface RvScenarioArgs {
  /** Radial velocities (default 200). */
  points?: number;
  searchMode?: boolean;
  seed?: string;
}

const jointTruth = {
  period: 3.7124,
  tc: ORIGIN + 1.318,
  eccentricity: 0.08,
  omega: 62,
  semiAmplitude: 14.2,
  radiusRatio: 0.094,
  impactParameter: 0.36,
};

/** The invented joint system: builder input with simulated data. */
export function jointScenarioInput(args: JointScenarioArgs = {}): Parameters<typeof createJointModel>[0] {
  const nLc = args.lightCurvePoints ?? 2000;
  const nRv = args.rvPoints ?? Math.max(20, Math.round(nLc / 40));
  const rng = createRandomStream(args.seed ?? 'apsis bench joint');
  const rvTimes = Float64Array.from({ length: nRv }, () => ORIGIN - 120 + 300 * rng.uniform()).sort();
  const rv = simulateRadialVelocities(
    { times: rvTimes, instrument: 'spectrograph', errors: 2.5, planets: [jointTruth], offsets: { spectrograph: -7.5 }, jitters: { spectrograph: 1.5 } },
    rng,
  ).data;
  const lcTimes = Float64Array.from({ length: nLc }, (_, i) => ORIGIN + (40 * (i + 0.5)) / nLc);
  const lc = simulateLightCurve(
    { label: 'photometer', times: lcTimes, errors: 4e-4, exposureTime: 2 / 1440, planets: [jointTruth], starDensity: 1.35, u1: 0.41, u2: 0.23, jitter: 1e-4 },
    rng,
  ).data;
  return {
    rv,
    lightCurves: [{ ...lc, subSamples: 1 }],
    planets: [{ label: 'b', period: 3.712, tc: ORIGIN + 1.32 }],
    ...(args.searchMode === false ? { searchMode: false } : {}),
  };
}

/** The joint model of the invented system (a worker recipe export). */
export async function jointScenario(args: JointScenarioArgs = {}): Promise<PlanetSystemModel> {
  return createJointModel(jointScenarioInput(args));
}

const rvTruth = [
  { period: 5.213, tc: ORIGIN + 2.1, eccentricity: 0.12, omega: 110, semiAmplitude: 9.1 },
  { period: 23.71, tc: ORIGIN + 7.9, eccentricity: 0.24, omega: -40, semiAmplitude: 6.4 },
];

/** The invented two-planet system: builder input with simulated data. */
export function rvScenarioInput(args: RvScenarioArgs = {}): Parameters<typeof createRvModel>[0] {
  const n = args.points ?? 200;
  const rng = createRandomStream(args.seed ?? 'apsis bench rv');
  const times = Float64Array.from({ length: n }, () => ORIGIN + 400 * rng.uniform()).sort();
  const instrument = Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 'red' : 'blue'));
  const errors = Float64Array.from({ length: n }, (_, i) => (i % 3 === 0 ? 2.8 : 1.6));
  const rv = simulateRadialVelocities(
    { times, instrument, errors, planets: rvTruth, offsets: { red: 12.5, blue: -3.1 }, jitters: { red: 2, blue: 1.2 } },
    rng,
  ).data;
  return {
    rv,
    planets: [
      { label: 'b', period: 5.213, tc: ORIGIN + 2.1 },
      { label: 'c', period: 23.7, tc: ORIGIN + 7.8 },
    ],
    ...(args.searchMode === false ? { searchMode: false } : {}),
  };
}

/** The two-planet RV model of the invented system (a worker recipe export). */
export async function rvScenario(args: RvScenarioArgs = {}): Promise<PlanetSystemModel> {
  return createRvModel(rvScenarioInput(args));
}

export interface TransitScenarioArgs {
  /** Light-curve points (default 20000). */
  lightCurvePoints?: number;
  searchMode?: boolean;
  seed?: string;
}

const transitTruth = [
  { period: 2.8517, tc: ORIGIN + 0.734, radiusRatio: 0.081, impactParameter: 0.28 },
  { period: 7.3391, tc: ORIGIN + 3.012, radiusRatio: 0.058, impactParameter: 0.52 },
];

/** The invented two-planet transiting system: builder input with a simulated light curve. */
export function transitScenarioInput(args: TransitScenarioArgs = {}): Parameters<typeof createTransitModel>[0] {
  const n = args.lightCurvePoints ?? 20000;
  const rng = createRandomStream(args.seed ?? 'apsis bench transit');
  const times = Float64Array.from({ length: n }, (_, i) => ORIGIN + (40 * (i + 0.5)) / n);
  const lc = simulateLightCurve(
    { label: 'imager', times, errors: 3e-4, exposureTime: 2 / 1440, planets: transitTruth, starDensity: 1.62, u1: 0.38, u2: 0.26, jitter: 8e-5 },
    rng,
  ).data;
  return {
    lightCurves: [{ ...lc, subSamples: 1 }],
    planets: [
      { label: 'b', period: 2.8515, tc: ORIGIN + 0.735 },
      { label: 'c', period: 7.339, tc: ORIGIN + 3.01 },
    ],
    ...(args.searchMode === false ? { searchMode: false } : {}),
  };
}

/** The transit model of the invented two-planet system (a worker recipe export). */
export async function transitScenario(args: TransitScenarioArgs = {}): Promise<PlanetSystemModel> {
  return createTransitModel(transitScenarioInput(args));
}

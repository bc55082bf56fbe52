/**
 * Simulated data for tests and demos: radial velocities and light curves drawn from
 * given true values with an explicit random source (a seeded `RandomStream`), through
 * the same float64 kernels the models use. Light curves are integrated over each
 * exposure by the midpoint rule with many sub-samples (default 41, finer than the
 * models' default), so exposure smearing is simulated more accurately than it is fitted.
 * Angles are in degrees, as everywhere in the builders.
 */
import type { RandomSource } from '@apsis/core';
import { createRvCurveKernel } from '../orbit/rvCurve.js';
import { createLightCurveKernel } from '../transit/lightCurve.js';
import { FitSettingsError } from './errors.js';
import type { LightCurveInput, NumberColumn, RvDataInput } from './inputs.js';
import { scaledAxisOf } from './systemLikelihood.js';

const RAD = Math.PI / 180;

/** Simulated data ready for a builder, and the noiseless model it was drawn around. */
export interface SimulatedData<T> {
  readonly data: T;
  /** The true model at each point (m/s or flux), before noise. */
  readonly noiseless: Float64Array;
}

/** True orbit and size of one simulated planet. */
export interface SimulatedPlanet {
  /** Period, days. */
  readonly period: number;
  /** Time of inferior conjunction (mid-transit), days, same system as the times. */
  readonly tc: number;
  /** Eccentricity (default 0). */
  readonly eccentricity?: number;
  /** Argument of periastron, degrees (default 90). */
  readonly omega?: number;
  /** Semi-amplitude, m/s (radial velocities). */
  readonly semiAmplitude?: number;
  /** Radius ratio R_p/R_* (light curves). */
  readonly radiusRatio?: number;
  /** Impact parameter, stellar radii (light curves). */
  readonly impactParameter?: number;
  /** a/R_* (light curves; default from `starDensity`). */
  readonly scaledSemiMajorAxis?: number;
}

/** What {@link simulateRadialVelocities} draws from. */
export interface RvSimulation {
  readonly times: NumberColumn;
  /** Instrument label per point, or one for all. */
  readonly instrument: readonly string[] | string;
  /** Measurement errors, m/s: one for all or one per point. */
  readonly errors: number | NumberColumn;
  readonly planets: readonly SimulatedPlanet[];
  /** Offset per instrument label, m/s. */
  readonly offsets: Readonly<Record<string, number>>;
  /** Jitter per instrument label, m/s (default 0). */
  readonly jitters?: Readonly<Record<string, number>>;
  /** Trend about `epoch` (days): linear m/s/d, quadratic m/s/d². */
  readonly trend?: { readonly epoch: number; readonly linear?: number; readonly quadratic?: number };
}

function column(v: number | NumberColumn, n: number, field: string): Float64Array {
  if (typeof v === 'number') return new Float64Array(n).fill(v);
  if (v.length !== n) throw new FitSettingsError(`${field}.length`, v.length, `${n}, one per time`);
  return Float64Array.from(v);
}

/**
 * Radial velocities v = Σ planets + offset + trend + noise, noise normal with variance
 * error² + jitter² per point (m/s). Returns data ready for the builders' `rv` field.
 */
export function simulateRadialVelocities(spec: RvSimulation, random: RandomSource): SimulatedData<RvDataInput> {
  const times = Float64Array.from(spec.times);
  const n = times.length;
  const errors = column(spec.errors, n, 'errors');
  const labels = typeof spec.instrument === 'string' ? new Array<string>(n).fill(spec.instrument) : [...spec.instrument];
  if (labels.length !== n) throw new FitSettingsError('instrument.length', labels.length, `${n}, one per time`);
  const truth = new Float64Array(n);
  if (spec.planets.length > 0) {
    const origin = times[0];
    const kernel = createRvCurveKernel({ times: times.map((t) => t - origin), planets: spec.planets.length });
    const params = new Float64Array(5 * spec.planets.length);
    spec.planets.forEach((p, i) => {
      params.set([p.period, p.tc - origin, p.eccentricity ?? 0, (p.omega ?? 90) * RAD, p.semiAmplitude ?? 0], 5 * i);
    });
    kernel.value(params, truth);
  }
  const values = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const off = spec.offsets[labels[i]];
    if (off === undefined) throw new FitSettingsError(`offsets.${labels[i]}`, undefined, 'an offset (m/s) for every instrument label');
    const jit = spec.jitters?.[labels[i]] ?? 0;
    const d = spec.trend ? times[i] - spec.trend.epoch : 0;
    truth[i] += off + d * ((spec.trend?.linear ?? 0) + d * (spec.trend?.quadratic ?? 0));
    values[i] = truth[i] + Math.sqrt(errors[i] ** 2 + jit ** 2) * random.normal();
  }
  return { data: { times, values, errors, instrument: labels }, noiseless: truth };
}

/** What {@link simulateLightCurve} draws from. */
export interface LightCurveSimulation {
  readonly label: string;
  readonly times: NumberColumn;
  /** Flux errors: one for all or one per point. */
  readonly errors: number | NumberColumn;
  /** Exposure time, days (default 0). */
  readonly exposureTime?: number;
  /** Sub-samples per exposure used to simulate (default 41). */
  readonly simulationSubSamples?: number;
  readonly planets: readonly SimulatedPlanet[];
  /** Stellar density, g/cm³, for planets without `scaledSemiMajorAxis`. */
  readonly starDensity?: number;
  /** Quadratic limb darkening. */
  readonly u1: number;
  readonly u2: number;
  /** Out-of-transit flux (default 1). */
  readonly baseline?: number;
  /** Extra white noise, flux units (default 0). */
  readonly jitter?: number;
  /** Third light D (default 0): the transit depth is divided by 1 + D. */
  readonly dilution?: number;
  readonly band?: string;
}

/**
 * A light curve f0 (F + D)/(1 + D) + noise, F the exposure-averaged limb-darkened flux
 * of all planets (Mandel & Agol 2002 through the models' kernel), noise normal with
 * variance error² + jitter². Returns data ready for the builders' `lightCurves` field
 * (with the exposure time; the fit's sub-samples are left to the builder's default).
 */
export function simulateLightCurve(spec: LightCurveSimulation, random: RandomSource): SimulatedData<LightCurveInput> {
  const times = Float64Array.from(spec.times);
  const n = times.length;
  const errors = column(spec.errors, n, 'errors');
  const origin = times[0];
  const exposure = spec.exposureTime ?? 0;
  const kernel = createLightCurveKernel({
    times: times.map((t) => t - origin),
    planets: spec.planets.length,
    angle: 'impact',
    exposureTime: exposure,
    subSamples: exposure > 0 ? (spec.simulationSubSamples ?? 41) : 1,
  });
  const params = new Float64Array(7 * spec.planets.length + 2);
  spec.planets.forEach((p, i) => {
    const aR = p.scaledSemiMajorAxis ?? (spec.starDensity !== undefined ? scaledAxisOf(spec.starDensity, p.period) : NaN);
    if (!(aR > 1)) throw new FitSettingsError(`planets[${i}].scaledSemiMajorAxis`, aR, 'a/R_* > 1, or a starDensity (g/cm^3)');
    params.set([p.period, p.tc - origin, p.eccentricity ?? 0, (p.omega ?? 90) * RAD, aR, p.impactParameter ?? 0, p.radiusRatio ?? 0.1], 7 * i);
  });
  params[7 * spec.planets.length] = spec.u1;
  params[7 * spec.planets.length + 1] = spec.u2;
  const F = kernel.flux(params, new Float64Array(n));
  const f0 = spec.baseline ?? 1;
  const D = spec.dilution ?? 0;
  const jit = spec.jitter ?? 0;
  const truth = new Float64Array(n);
  const flux = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    truth[i] = (f0 * (F[i] + D)) / (1 + D);
    flux[i] = truth[i] + Math.sqrt(errors[i] ** 2 + jit * jit) * random.normal();
  }
  return {
    data: {
      label: spec.label,
      times,
      flux,
      errors,
      ...(exposure > 0 ? { exposureTime: exposure } : {}),
      ...(spec.band !== undefined ? { band: spec.band } : {}),
    },
    noiseless: truth,
  };
}

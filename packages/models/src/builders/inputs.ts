/**
 * What the model builders take: data, planets, the star and options, as plain JSON-able
 * objects (so that a model can be rebuilt in a worker thread from its description).
 * Times are days in any float64 time system (BJD, or days since some origin); the
 * builders subtract a reference epoch themselves. Angles given or reported by the
 * builders are in degrees; velocities in m/s; stellar mass and radius in solar units.
 */
import type { PriorInput } from './priorInput.js';

/** A column of numbers. */
export type NumberColumn = readonly number[] | Float64Array | Float32Array;

/** Radial velocities: one entry per measurement. */
export interface RvDataInput {
  /** Observation times, days. */
  readonly times: NumberColumn;
  /** Measured stellar radial velocities, m/s. */
  readonly values: NumberColumn;
  /** One-sigma measurement errors, m/s, positive. */
  readonly errors: NumberColumn;
  /** Instrument label of each point, or one label for every point. */
  readonly instrument: readonly string[] | string;
  /**
   * The instruments, in the order their parameters are listed (default: order of first
   * appearance in `instrument`). A point whose label is not listed is an error.
   */
  readonly instruments?: readonly string[];
}

/** One light curve: one instrument and band, with its own baseline and jitter. */
export interface LightCurveInput {
  /** Label used in parameter names (`baseline_<label>`): letters, digits, underscores. */
  readonly label: string;
  /** Mid-exposure times, days. */
  readonly times: NumberColumn;
  /** Measured flux (any normalisation: the baseline parameter scales the model). */
  readonly flux: NumberColumn;
  /** One-sigma flux errors, positive, same units as `flux`. */
  readonly errors: NumberColumn;
  /** Exposure (integration) time, days: one for all points or one per point. Default 0. */
  readonly exposureTime?: number | NumberColumn;
  /**
   * Sub-samples per exposure for the exposure average (Kipping 2010). Default: enough
   * that each sub-sample spans at most 2 minutes.
   */
  readonly subSamples?: number;
  /** Limb-darkening group: light curves with the same band share (q1, q2). Default: `label`. */
  readonly band?: string;
  /** Fit a third-light dilution for this light curve. Default false. */
  readonly dilution?: boolean;
}

/** One planet: starting guesses, and what sets its default priors. */
export interface PlanetInput {
  /** Label used in parameter names (`period_<label>`): letters, digits, underscores. */
  readonly label: string;
  /** Orbital period guess, days (centre of the default period prior). */
  readonly period: number;
  /** Standard deviation of the default normal period prior, days (default from the data). */
  readonly periodUncertainty?: number;
  /**
   * A time of inferior conjunction (mid-transit for a transiting planet), days, in the
   * data's time system. Needed for transiting planets; for radial velocities alone it is
   * estimated from a sinusoid fit when omitted.
   */
  readonly tc?: number;
  /** Standard deviation of `tc`, days (default from the data; see docs). */
  readonly tcUncertainty?: number;
  /** Fit eccentricity (default true with radial velocities, false for transits alone). */
  readonly eccentric?: boolean;
  /** Starting guess of the semi-amplitude K, m/s (default from a sinusoid fit). */
  readonly semiAmplitude?: number;
  /** Starting guess of the radius ratio R_p/R_* (default from the transit depth). */
  readonly radiusRatio?: number;
  /** Starting guess of the impact parameter, stellar radii (default 0.3). */
  readonly impactParameter?: number;
  /** Starting guess of a/R_* (only with `geometry: 'scaledAxis'`). */
  readonly scaledSemiMajorAxis?: number;
  /** Joint fits only: false for a planet seen in the radial velocities only. Default true. */
  readonly transiting?: boolean;
}

/** The star. Masses in nominal solar masses, radii in nominal solar radii. */
export interface StarInput {
  /** Stellar mass; with `massUncertainty` > 0 it is a parameter with a normal prior. */
  readonly mass?: number;
  readonly massUncertainty?: number;
  /** Stellar radius; with `radiusUncertainty` > 0 it is a parameter with a normal prior. */
  readonly radius?: number;
  readonly radiusUncertainty?: number;
  /** Stellar density guess, g/cm³; with `densityUncertainty` > 0 the prior is normal. */
  readonly density?: number;
  readonly densityUncertainty?: number;
}

/** Options shared by every builder. */
export interface SharedModelInput {
  readonly planets: readonly PlanetInput[];
  readonly star?: StarInput;
  /**
   * Reference epoch, days in the data's time system: reported times (`tc_*`,
   * `periastronTime_*`) are days since it. Default: the middle of the data, rounded to a
   * whole day.
   */
  readonly referenceEpoch?: number;
  /** Priors by parameter name, replacing the defaults (unknown names are an error). */
  readonly priors?: Readonly<Record<string, PriorInput>>;
  /** Parameters held fixed, by name (unknown names are an error). */
  readonly fixed?: Readonly<Record<string, number>>;
  /** Starting values by parameter name, replacing the builders' guesses. */
  readonly start?: Readonly<Record<string, number>>;
  /**
   * Search the posterior mode from the starting guess before sampling, and centre and
   * scale the sampler's coordinates there (default true). See docs/fitting-radial-velocities.md.
   */
  readonly searchMode?: boolean;
}

/** Trend of the radial velocities about the reference epoch. */
export type TrendOption = 'none' | 'linear' | 'quadratic';

/** How the transit geometry is parametrised. */
export type GeometryOption = 'density' | 'scaledAxis';

/** How quadratic limb darkening is sampled. */
export type LimbDarkeningOption = 'kipping' | 'quadratic';

/** Input of {@link createRvModel}. */
export interface RvModelInput extends SharedModelInput {
  readonly rv: RvDataInput;
  /** Default 'none'. */
  readonly trend?: TrendOption;
}

/** Input of {@link createTransitModel}. */
export interface TransitModelInput extends SharedModelInput {
  readonly lightCurves: readonly LightCurveInput[];
  /** 'density' (default): one stellar density for all planets; 'scaledAxis': a/R_* per planet. */
  readonly geometry?: GeometryOption;
  /** 'kipping' (default): (q1, q2) uniform on [0, 1]² per band; 'quadratic': (u1, u2). */
  readonly limbDarkening?: LimbDarkeningOption;
}

/** Input of {@link createJointModel}. */
export interface JointModelInput extends SharedModelInput {
  readonly rv: RvDataInput;
  readonly trend?: TrendOption;
  readonly lightCurves: readonly LightCurveInput[];
  readonly geometry?: GeometryOption;
  readonly limbDarkening?: LimbDarkeningOption;
}

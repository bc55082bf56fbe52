/**
 * The demo's invented planetary system and its observations. Everything here is
 * fiction: the star Orvanne, its planets b and c, the two spectrographs (Lanternfish
 * and Saltmarsh) and the photometer (Tallowlight) do not exist.
 *
 * - Orvanne: a star of 0.91 ± 0.04 solar masses and 0.94 ± 0.03 solar radii (the
 *   "catalogue" values a user would start from; the simulation uses the central values).
 * - Orvanne b: a warm Saturn on a 4.31-day, nearly circular orbit that transits.
 * - Orvanne c: a giant planet on an eccentric 38.7-day orbit, seen in the radial
 *   velocities only (it does not transit).
 * - Radial velocities over two observing seasons a year apart, unevenly sampled, from
 *   two spectrographs with their own zero points (offsets) and extra scatter (jitter).
 * - A 24-day light curve from a photometer with 30-minute exposures, long enough
 *   compared with the 16-minute ingress of b that the model must average over each
 *   exposure (Kipping 2010).
 *
 * Times are BJD-like days (about 2.46e6), deliberately: the fit must handle them in
 * float64 (docs/numerics.md). Units: days, m/s, degrees, solar masses and radii,
 * g/cm³, relative flux.
 */

/** The star as a user would describe it (central value and 1-sigma uncertainty). */
export const star = {
  name: 'Orvanne',
  mass: 0.91,
  massUncertainty: 0.04,
  radius: 0.94,
  radiusUncertainty: 0.03,
} as const;

/** Mean stellar density implied by a mass and radius (solar units), g/cm³. */
export function densityFromMassRadius(mass: number, radius: number): number {
  // Nominal solar mass and radius: GM_sun = 1.3271244e20 m³/s² (IAU 2015 B3) over
  // G = 6.6743e-11 (CODATA 2018); R_sun = 6.957e8 m (IAU 2015 B3).
  const sunMassKg = 1.3271244e20 / 6.6743e-11;
  const rM = radius * 6.957e8;
  return (mass * sunMassKg) / ((4 / 3) * Math.PI * rM * rM * rM) / 1000;
}

/** True orbit and size of one planet: what the data are simulated from. */
export interface TruePlanet {
  readonly label: string;
  /** Period, days. */
  readonly period: number;
  /** Time of inferior conjunction (mid-transit for b), BJD-like days. */
  readonly tc: number;
  readonly eccentricity: number;
  /** Argument of periastron, degrees. */
  readonly omega: number;
  /** RV semi-amplitude, m/s. */
  readonly semiAmplitude: number;
  readonly transiting: boolean;
  /** Radius ratio R_p/R_* (transiting planets). */
  readonly radiusRatio?: number;
  /** Impact parameter, stellar radii (transiting planets). */
  readonly impactParameter?: number;
}

export const planets: readonly TruePlanet[] = [
  {
    label: 'b',
    period: 4.324613,
    tc: 2460801.36472,
    eccentricity: 0.04,
    omega: 62,
    semiAmplitude: 36.8,
    transiting: true,
    radiusRatio: 0.0862,
    impactParameter: 0.38,
  },
  {
    label: 'c',
    period: 38.71,
    tc: 2460772.9,
    eccentricity: 0.21,
    omega: 118,
    semiAmplitude: 17.3,
    transiting: false,
  },
];

/** A spectrograph: how it samples and how its velocities are off. */
export interface Spectrograph {
  /** Label used in parameter names (`offset_<label>`). */
  readonly label: string;
  readonly name: string;
  /** Nights observed per season. */
  readonly nightsPerSeason: number;
  /** Range of the quoted 1-sigma errors, m/s. */
  readonly errorRange: readonly [number, number];
  /** True zero point of its velocities, m/s. */
  readonly offset: number;
  /** True extra scatter not in the quoted errors, m/s. */
  readonly jitter: number;
}

export const spectrographs: readonly Spectrograph[] = [
  { label: 'lanternfish', name: 'Lanternfish échelle spectrograph', nightsPerSeason: 19, errorRange: [1.6, 2.6], offset: -4.3, jitter: 2.4 },
  { label: 'saltmarsh', name: 'Saltmarsh fibre spectrograph', nightsPerSeason: 12, errorRange: [3.2, 5.0], offset: 27.9, jitter: 4.1 },
];

/** Observing seasons of the radial velocities: [first, last] night, BJD-like days. */
export const seasons: readonly (readonly [number, number])[] = [
  [2460392.5, 2460508.5],
  [2460748.5, 2460866.5],
];

/** The photometer and its light curve. */
export const photometer = {
  label: 'tallowlight',
  name: 'Tallowlight wide-field photometer',
  /** First and last mid-exposure time, BJD-like days. */
  start: 2460790.0,
  end: 2460814.0,
  /** A gap with no data (a downlink pause), BJD-like days. */
  gap: [2460799.2, 2460800.1] as const,
  /** Exposure (integration) time and cadence: 30 minutes, in days. */
  exposureTime: 30 / 1440,
  /** Quoted 1-sigma error per exposure, relative flux. */
  error: 4.5e-4,
  /** True extra white noise, relative flux. */
  jitter: 1.5e-4,
  /** True out-of-transit flux. */
  baseline: 0.99985,
  /** True quadratic limb-darkening coefficients of the photometer's band. */
  u1: 0.46,
  u2: 0.21,
} as const;

/** The seed of the simulated observations (fixed, so every run sees the same data). */
export const dataSeed = 'Orvanne observations, seed 2041';

/**
 * The starting guesses a user would bring: periods and a transit time from a first
 * look at the data (not the true values), and no eccentricity information.
 */
export const guesses = {
  b: { period: 4.3246, tc: 2460801.364 },
  c: { period: 38.8, tc: 2460773.5 },
} as const;

/**
 * Conversions between the ways a transit geometry is parametrised: impact parameter
 * and inclination (Winn 2010, "Transits and Occultations", eq. 7), scaled semi-major
 * axis a/R_* and mean stellar density (Seager & Mallén-Ornelas 2003, ApJ 585, 1038;
 * Kepler's third law with the planet's mass neglected).
 */
import { GRAVITATIONAL_CONSTANT, SECONDS_PER_DAY } from '../orbit/constants.js';
import { TransitParameterError } from './errors.js';
import { checkScalar, eccentricityRule, finiteRule, inclinationRule, positiveRule, scaledSemiMajorAxisRule } from './validation.js';

/** Factor (1 - e²)/(1 + e sin omega) that turns (a/R_*) cos i into b (Winn 2010, eq. 7). */
function eccentricFactor(e: number, omega: number): number {
  return ((1 - e) * (1 + e)) / (1 + e * Math.sin(omega));
}

/**
 * Impact parameter b = (a/R_*) cos i (1 - e²)/(1 + e sin omega) (Winn 2010, eq. 7),
 * in stellar radii.
 *
 * @param inclination orbital inclination i, radians in (0, pi).
 * @param scaledSemiMajorAxis a/R_* > 1.
 * @param eccentricity e in [0, 1), default 0.
 * @param omega argument of periastron, radians, default 0.
 */
export function impactFromInclination(inclination: number, scaledSemiMajorAxis: number, eccentricity = 0, omega = 0): number {
  checkScalar(inclinationRule, inclination, 'inclination');
  checkScalar(scaledSemiMajorAxisRule, scaledSemiMajorAxis, 'scaledSemiMajorAxis');
  checkScalar(eccentricityRule, eccentricity, 'eccentricity');
  checkScalar(finiteRule, omega, 'omega');
  return scaledSemiMajorAxis * Math.cos(inclination) * eccentricFactor(eccentricity, omega);
}

/**
 * Inclination (radians, in (0, pi)) from the impact parameter, inverting Winn (2010)
 * eq. 7: cos i = b (1 + e sin omega)/((a/R_*)(1 - e²)).
 *
 * @throws TransitParameterError if |cos i| ≥ 1 (the orbit cannot reach that b).
 */
export function inclinationFromImpact(impactParameter: number, scaledSemiMajorAxis: number, eccentricity = 0, omega = 0): number {
  checkScalar(finiteRule, impactParameter, 'impactParameter');
  checkScalar(scaledSemiMajorAxisRule, scaledSemiMajorAxis, 'scaledSemiMajorAxis');
  checkScalar(eccentricityRule, eccentricity, 'eccentricity');
  checkScalar(finiteRule, omega, 'omega');
  const ci = impactParameter / (scaledSemiMajorAxis * eccentricFactor(eccentricity, omega));
  if (!(Math.abs(ci) < 1)) {
    throw new TransitParameterError('impactParameter', impactParameter, `|b| < ${scaledSemiMajorAxis * eccentricFactor(eccentricity, omega)} for this orbit (|cos i| < 1)`);
  }
  return Math.acos(ci);
}

/**
 * Mean stellar density rho_* = 3 pi (a/R_*)³ / (G P²) in kg m^-3 (Seager &
 * Mallén-Ornelas 2003, planet mass neglected).
 *
 * @param scaledSemiMajorAxis a/R_*, positive.
 * @param period orbital period, days.
 */
export function stellarDensityFromScaledSemiMajorAxis(scaledSemiMajorAxis: number, period: number): number {
  checkScalar(positiveRule, scaledSemiMajorAxis, 'scaledSemiMajorAxis');
  checkScalar(positiveRule, period, 'period');
  const seconds = period * SECONDS_PER_DAY;
  return (3 * Math.PI * scaledSemiMajorAxis ** 3) / (GRAVITATIONAL_CONSTANT * seconds * seconds);
}

/**
 * Scaled semi-major axis a/R_* = (G rho_* P² / (3 pi))^{1/3} from the mean stellar
 * density (kg m^-3) and the period (days), inverting
 * {@link stellarDensityFromScaledSemiMajorAxis}.
 */
export function scaledSemiMajorAxisFromDensity(stellarDensity: number, period: number): number {
  checkScalar(positiveRule, stellarDensity, 'stellarDensity');
  checkScalar(positiveRule, period, 'period');
  const seconds = period * SECONDS_PER_DAY;
  return Math.cbrt((GRAVITATIONAL_CONSTANT * stellarDensity * seconds * seconds) / (3 * Math.PI));
}

/**
 * a/R_* from density and period with its partial derivatives, for chaining a
 * density parametrisation into the light-curve gradient: writes
 * [a/R_*, ∂(a/R_*)/∂rho_* (per kg m^-3), ∂(a/R_*)/∂P (per day)] into out[at..at+2].
 * Since a/R_* ∝ rho^{1/3} P^{2/3}: ∂/∂rho = (a/R_*)/(3 rho), ∂/∂P = 2 (a/R_*)/(3 P).
 */
export function scaledSemiMajorAxisFromDensityPartials(stellarDensity: number, period: number, out: Float64Array, at = 0): void {
  const aR = scaledSemiMajorAxisFromDensity(stellarDensity, period);
  if (!(out instanceof Float64Array) || !(Number.isInteger(at) && at >= 0 && at + 3 <= out.length)) {
    throw new TransitParameterError('out', out, `a Float64Array with room for 3 values from offset ${String(at)}`);
  }
  out[at] = aR;
  out[at + 1] = aR / (3 * stellarDensity);
  out[at + 2] = (2 * aR) / (3 * period);
}

/**
 * Anomalies and separation on a Keplerian ellipse (radians throughout).
 *
 * Conventions (Winn 2010, "Transits and Occultations", eqs. 2-4): inferior conjunction
 * of the planet (mid-transit) happens at true anomaly f = pi/2 - omega.
 */
import { OrbitParameterError } from './errors.js';
import { solveKeplerInto } from './kepler.js';

function checkE(e: number): void {
  if (!(e >= 0 && e < 1)) throw new OrbitParameterError('eccentricity', e, 'a number in [0, 1)');
}
function checkFinite(x: number, field: string): void {
  if (!Number.isFinite(x)) throw new OrbitParameterError(field, x, 'a finite number (radians)');
}

/**
 * True anomaly f (radians) from the eccentric anomaly E (radians), by the half-angle
 * form f = 2 atan2(sqrt(1 + e) sin(E/2), sqrt(1 - e) cos(E/2)), which is accurate for
 * all 0 <= e < 1. Whole turns of E are kept: f(E + 2 pi) = f(E) + 2 pi.
 */
export function trueAnomalyFromEccentric(eccentricAnomaly: number, eccentricity: number): number {
  checkFinite(eccentricAnomaly, 'eccentricAnomaly');
  checkE(eccentricity);
  const turns = Math.round(eccentricAnomaly / (2 * Math.PI));
  const E = eccentricAnomaly - turns * 2 * Math.PI;
  const h = 0.5 * E;
  const f = 2 * Math.atan2(Math.sqrt(1 + eccentricity) * Math.sin(h), Math.sqrt(1 - eccentricity) * Math.cos(h));
  return f + turns * 2 * Math.PI;
}

/**
 * Eccentric anomaly E (radians) from the true anomaly f (radians), the inverse of
 * {@link trueAnomalyFromEccentric}: E = 2 atan2(sqrt(1 - e) sin(f/2), sqrt(1 + e) cos(f/2)),
 * keeping whole turns.
 */
export function eccentricFromTrueAnomaly(trueAnomaly: number, eccentricity: number): number {
  checkFinite(trueAnomaly, 'trueAnomaly');
  checkE(eccentricity);
  const turns = Math.round(trueAnomaly / (2 * Math.PI));
  const f = trueAnomaly - turns * 2 * Math.PI;
  const h = 0.5 * f;
  const E = 2 * Math.atan2(Math.sqrt(1 - eccentricity) * Math.sin(h), Math.sqrt(1 + eccentricity) * Math.cos(h));
  return E + turns * 2 * Math.PI;
}

/** Mean anomaly M = E - e sin E (radians) from the eccentric anomaly (radians). */
export function meanFromEccentricAnomaly(eccentricAnomaly: number, eccentricity: number): number {
  checkFinite(eccentricAnomaly, 'eccentricAnomaly');
  checkE(eccentricity);
  return eccentricAnomaly - eccentricity * Math.sin(eccentricAnomaly);
}

/** True anomaly (radians) from the mean anomaly (radians): Kepler solve, then the half-angle form. */
export function trueFromMeanAnomaly(meanAnomaly: number, eccentricity: number): number {
  checkFinite(meanAnomaly, 'meanAnomaly');
  checkE(eccentricity);
  const s = new Float64Array(3);
  solveKeplerInto(meanAnomaly, eccentricity, s, 0);
  return trueAnomalyFromEccentric(s[0], eccentricity);
}

/** Star-planet separation in units of the semi-major axis, r/a = 1 - e cos E (dimensionless). */
export function separationOverA(eccentricAnomaly: number, eccentricity: number): number {
  checkFinite(eccentricAnomaly, 'eccentricAnomaly');
  checkE(eccentricity);
  return 1 - eccentricity * Math.cos(eccentricAnomaly);
}

/**
 * Mean anomaly at inferior conjunction M_c (radians, in [-pi, pi]) for an orbit of
 * eccentricity e and argument of periastron omega (radians): f_c = pi/2 - omega,
 * E_c from f_c by the half-angle form, M_c = E_c - e sin E_c. No input checks.
 */
export function conjunctionMeanAnomalyUnchecked(e: number, omega: number): number {
  // Reduce f_c = pi/2 - omega to [-pi, pi] first so that M_c is canonical.
  let fc = 0.5 * Math.PI - omega;
  fc -= 2 * Math.PI * Math.round(fc / (2 * Math.PI));
  const h = 0.5 * fc;
  const Ec = 2 * Math.atan2(Math.sqrt(1 - e) * Math.sin(h), Math.sqrt(1 + e) * Math.cos(h));
  return Ec - e * Math.sin(Ec);
}

/**
 * Mean anomaly at inferior conjunction (mid-transit), radians in [-pi, pi]; see
 * {@link conjunctionMeanAnomalyUnchecked}. For a circular orbit it is pi/2 - omega
 * (mean and true anomaly coincide; omega then only sets the zero of the phase).
 */
export function conjunctionMeanAnomaly(eccentricity: number, omega: number): number {
  checkE(eccentricity);
  checkFinite(omega, 'omega');
  return conjunctionMeanAnomalyUnchecked(eccentricity, omega);
}

/**
 * Partial derivatives of the conjunction mean anomaly M_c(e, omega), written into
 * out[at] = dM_c/de and out[at + 1] = dM_c/domega:
 *   dM_c/de     = -sqrt(1 - e^2) cos(omega) (2 + e sin omega) / (1 + e sin omega)^2,
 *   dM_c/domega = -(1 - e^2)^(3/2) / (1 + e sin omega)^2,
 * from dM/df = (1 - e^2)^(3/2) / (1 + e cos f)^2 and
 * dM/de at fixed f = -sqrt(1 - e^2) sin f (2 + e cos f) / (1 + e cos f)^2,
 * evaluated at f_c = pi/2 - omega (cos f_c = sin omega, sin f_c = cos omega).
 */
export function conjunctionMeanAnomalyPartialsInto(e: number, omega: number, out: Float64Array, at = 0): void {
  const sw = Math.sin(omega);
  const cw = Math.cos(omega);
  const oneMinusE2 = 1 - e * e;
  const rootOneMinusE2 = Math.sqrt(oneMinusE2);
  const g = 1 + e * sw;
  const invG2 = 1 / (g * g);
  out[at] = -rootOneMinusE2 * cw * (2 + e * sw) * invG2;
  out[at + 1] = -oneMinusE2 * rootOneMinusE2 * invG2;
}

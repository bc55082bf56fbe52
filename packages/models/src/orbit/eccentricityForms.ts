/**
 * Two ways to write eccentricity and argument of periastron:
 * - polar: (e, omega), e in [0, 1), omega in radians;
 * - root form: (h, k) = (sqrt(e) cos omega, sqrt(e) sin omega) on the open unit disk.
 *
 * The root form is smooth through e = 0 (where omega is undefined), and a uniform
 * density on the unit disk in (h, k) is uniform in e and in omega: the Jacobian
 * determinant |d(e, omega)/d(h, k)| is exactly 2 everywhere.
 */
import { OrbitParameterError } from './errors.js';

/** Eccentricity and argument of periastron (radians). */
export interface PolarEccentricity {
  eccentricity: number;
  /** Argument of periastron, radians; 0 when e = 0. */
  omega: number;
}

/** The root form (sqrt(e) cos omega, sqrt(e) sin omega). */
export interface RootEccentricity {
  h: number;
  k: number;
}

/** (e, omega) from (h, k) = (sqrt(e) cos omega, sqrt(e) sin omega); needs h^2 + k^2 < 1. */
export function polarFromRootEccentricity(h: number, k: number): PolarEccentricity {
  if (!Number.isFinite(h)) throw new OrbitParameterError('h', h, 'a finite number');
  if (!Number.isFinite(k)) throw new OrbitParameterError('k', k, 'a finite number');
  const e = h * h + k * k;
  if (!(e < 1)) throw new OrbitParameterError('h^2 + k^2', e, 'below 1 (eccentricity < 1)');
  return { eccentricity: e, omega: e === 0 ? 0 : Math.atan2(k, h) };
}

/** (h, k) = (sqrt(e) cos omega, sqrt(e) sin omega) from e in [0, 1) and omega (radians). */
export function rootFromPolarEccentricity(eccentricity: number, omega: number): RootEccentricity {
  if (!(eccentricity >= 0 && eccentricity < 1)) throw new OrbitParameterError('eccentricity', eccentricity, 'a number in [0, 1)');
  if (!Number.isFinite(omega)) throw new OrbitParameterError('omega', omega, 'a finite number (radians)');
  const r = Math.sqrt(eccentricity);
  return { h: r * Math.cos(omega), k: r * Math.sin(omega) };
}

/**
 * Jacobian d(e, omega)/d(h, k) as [de/dh, de/dk, domega/dh, domega/dk] =
 * [2h, 2k, -k/e, h/e]. Its determinant is 2 (log-determinant ln 2). Undefined at
 * e = 0, where omega is; use {@link rootEccentricityGradient} to chain gradients there.
 */
export function rootEccentricityJacobian(h: number, k: number): [number, number, number, number] {
  const e = h * h + k * k;
  if (!(e > 0)) throw new OrbitParameterError('h^2 + k^2', e, 'positive (omega is undefined at e = 0)');
  return [2 * h, 2 * k, -k / e, h / e];
}

/** log |det d(e, omega)/d(h, k)| = ln 2, the same at every point. */
export const ROOT_ECCENTRICITY_LOG_JACOBIAN = Math.LN2;

/**
 * Chains a gradient from (e, omega) to (h, k) without dividing by e:
 *   dL/dh = 2h dL/de - k (dL/domega)/e,  dL/dk = 2k dL/de + h (dL/domega)/e.
 * Pass `dOmegaOverE` = (dL/domega)/e computed directly (the radial-velocity kernels
 * provide it, finite at e = 0). Writes [dL/dh, dL/dk] into out[at..at+1].
 */
export function rootEccentricityGradient(
  h: number,
  k: number,
  dEccentricity: number,
  dOmegaOverE: number,
  out: Float64Array,
  at = 0,
): void {
  out[at] = 2 * h * dEccentricity - k * dOmegaOverE;
  out[at + 1] = 2 * k * dEccentricity + h * dOmegaOverE;
}

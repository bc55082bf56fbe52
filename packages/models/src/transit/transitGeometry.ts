/**
 * Public, validated access to the transit geometry of one planet: the sky-projected
 * separation z(t) (stellar radii), the in-front flag, and the partial derivatives of z
 * in the orbit parameters. The light-curve kernels use the unchecked
 * `separationInto` directly.
 */
import { z } from 'zod';
import { TransitParameterError } from './errors.js';
import { separationInto, separationPartialsInto } from './skySeparation.js';
import { TD_STRIDE, TRANSIT_PLANET_STRIDE, decodeTransitPlanets, transitParameterNames, type TransitAngleForm } from './transitParameters.js';

/** One planet's orbit for the geometry functions. Give impactParameter or inclination. */
export interface TransitOrbit {
  /** Orbital period, days. */
  period: number;
  /** Time of inferior conjunction (mid-transit), days since the caller's reference epoch. */
  tc: number;
  /** Eccentricity in [0, 1), default 0. */
  eccentricity?: number;
  /** Argument of periastron omega, radians, default 0 (Winn 2010 convention). */
  omega?: number;
  /** a/R_*, greater than 1. */
  scaledSemiMajorAxis: number;
  /** Impact parameter b, stellar radii (Winn 2010 eq. 7). */
  impactParameter?: number;
  /** Inclination, radians in (0, pi). */
  inclination?: number;
}

/** Separation and in-front flag at one time. */
export interface SkyPosition {
  /** Sky-projected centre separation, stellar radii. */
  z: number;
  /** True when the planet is between the star and the observer (Z > 0). */
  inFront: boolean;
}

const orbitSchema = z
  .object({
    period: z.number().positive(),
    tc: z.number(),
    eccentricity: z.number().nonnegative().lt(1).optional(),
    omega: z.number().optional(),
    scaledSemiMajorAxis: z.number().gt(1),
    impactParameter: z.number().optional(),
    inclination: z.number().gt(0).lt(Math.PI).optional(),
  })
  .strict();

const params = new Float64Array(TRANSIT_PLANET_STRIDE);
const decoded = new Float64Array(TD_STRIDE);
const scratch = new Float64Array(7);

function decode(orbit: TransitOrbit): TransitAngleForm {
  const parsed = orbitSchema.safeParse(orbit);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue.path.join('.') || 'orbit';
    throw new TransitParameterError(field, (orbit as unknown as Record<string, unknown>)?.[field], issue.message);
  }
  const o = parsed.data;
  const hasB = o.impactParameter !== undefined;
  const hasI = o.inclination !== undefined;
  if (hasB === hasI) {
    throw new TransitParameterError('impactParameter', o.impactParameter, 'exactly one of impactParameter and inclination');
  }
  const angle: TransitAngleForm = hasB ? 'impact' : 'inclination';
  params[0] = o.period;
  params[1] = o.tc;
  params[2] = o.eccentricity ?? 0;
  params[3] = o.omega ?? 0;
  params[4] = o.scaledSemiMajorAxis;
  params[5] = hasB ? (o.impactParameter as number) : (o.inclination as number);
  params[6] = 0.1; // radius ratio: only used for the transit window, not here
  const bad = decodeTransitPlanets(params, 1, angle, decoded);
  if (bad >= 0) {
    const name = transitParameterNames(1, angle)[bad].replace('[0]', '');
    throw new TransitParameterError(name, params[bad], bad === 5 ? 'a value the orbit can reach (|cos i| < 1)' : 'a value inside its support');
  }
  return angle;
}

function checkTime(time: number): void {
  if (!Number.isFinite(time)) throw new TransitParameterError('time', time, 'a finite number (days)');
}

/** Sky-projected separation (stellar radii) and in-front flag at `time` (days). */
export function skySeparation(time: number, orbit: TransitOrbit): SkyPosition {
  checkTime(time);
  decode(orbit);
  const inFront = separationInto(time, decoded, 0, scratch, 0);
  return { z: scratch[0], inFront };
}

/**
 * Separation and its partial derivatives at `time` (days): writes
 * [z, ∂z/∂P, ∂z/∂tc, ∂z/∂e, ∂z/∂omega, ∂z/∂(a/R_*), ∂z/∂b or ∂z/∂i] into out[at..at+6]
 * (the last one follows whichever of impactParameter / inclination the orbit gives)
 * and returns the in-front flag. Units: stellar radii per day, per radian, per unit.
 */
export function skySeparationWithPartials(time: number, orbit: TransitOrbit, out: Float64Array, at = 0): boolean {
  checkTime(time);
  if (!(out instanceof Float64Array) || !(Number.isInteger(at) && at >= 0 && at + 7 <= out.length)) {
    throw new TransitParameterError('out', out, `a Float64Array with room for 7 values from offset ${String(at)}`);
  }
  decode(orbit);
  const inFront = separationInto(time, decoded, 0, out, at);
  separationPartialsInto(decoded, 0, out, at + 1);
  return inFront;
}

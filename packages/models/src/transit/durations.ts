/**
 * Transit durations from the orbit (Winn 2010, "Transits and Occultations", eqs. 14,
 * 15 and 16): total duration T14 (first to fourth contact) and full duration T23
 * (second to third contact),
 *   T14 = (P/pi) asin[(R_* / a) √((1 + k)² - b²) / sin i] · √(1 - e²)/(1 + e sin omega),
 *   T23 = (P/pi) asin[(R_* / a) √((1 - k)² - b²) / sin i] · √(1 - e²)/(1 + e sin omega).
 * The eccentric factor (eq. 16) is Winn's approximation, accurate when the transit is
 * short compared with the period.
 */
import { z } from 'zod';
import { TransitParameterError } from './errors.js';

const durationSchema = z
  .object({
    period: z.number().positive(),
    scaledSemiMajorAxis: z.number().gt(1),
    radiusRatio: z.number().positive(),
    impactParameter: z.number().optional(),
    inclination: z.number().gt(0).lt(Math.PI).optional(),
    eccentricity: z.number().nonnegative().lt(1).optional(),
    omega: z.number().optional(),
  })
  .strict();

/** Orbit and planet size for {@link transitDurations}. Give b or i, not both. */
export interface TransitDurationInput {
  /** Orbital period, days. */
  period: number;
  /** a/R_*, greater than 1. */
  scaledSemiMajorAxis: number;
  /** Planet-to-star radius ratio k. */
  radiusRatio: number;
  /** Impact parameter b (stellar radii, Winn 2010 eq. 7). */
  impactParameter?: number;
  /** Inclination, radians in (0, pi). */
  inclination?: number;
  /** Eccentricity, default 0. */
  eccentricity?: number;
  /** Argument of periastron, radians, default 0. */
  omega?: number;
}

/** Durations in days; 0 when the contact does not occur (no transit, or grazing for T23). */
export interface TransitDurations {
  /** First to fourth contact, days. */
  total: number;
  /** Second to third contact, days (0 for a grazing transit). */
  full: number;
}

function part(P: number, aR: number, reach: number, b: number, sinI: number, factor: number): number {
  const chord2 = reach * reach - b * b;
  if (!(chord2 > 0)) return 0;
  const arg = Math.sqrt(chord2) / (aR * sinI);
  return (P / Math.PI) * Math.asin(Math.min(1, arg)) * factor;
}

/**
 * Total (T14) and full (T23) transit durations in days (Winn 2010, eqs. 14-16).
 *
 * @throws TransitParameterError naming the field that is missing or out of range.
 */
export function transitDurations(input: TransitDurationInput): TransitDurations {
  const parsed = durationSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue.path.join('.') || 'input';
    throw new TransitParameterError(field, (input as unknown as Record<string, unknown>)?.[field], issue.message);
  }
  const v = parsed.data;
  const e = v.eccentricity ?? 0;
  const omega = v.omega ?? 0;
  const eFactor = ((1 - e) * (1 + e)) / (1 + e * Math.sin(omega));
  let b: number;
  let i: number;
  if (v.impactParameter !== undefined && v.inclination !== undefined) {
    throw new TransitParameterError('impactParameter', v.impactParameter, 'either impactParameter or inclination, not both');
  } else if (v.impactParameter !== undefined) {
    b = v.impactParameter;
    const ci = b / (v.scaledSemiMajorAxis * eFactor);
    if (!(Math.abs(ci) < 1)) throw new TransitParameterError('impactParameter', b, 'a value with |cos i| < 1 for this orbit');
    i = Math.acos(ci);
  } else if (v.inclination !== undefined) {
    i = v.inclination;
    b = v.scaledSemiMajorAxis * Math.cos(i) * eFactor;
  } else {
    throw new TransitParameterError('impactParameter', undefined, 'impactParameter or inclination');
  }
  const factor = Math.sqrt((1 - e) * (1 + e)) / (1 + e * Math.sin(omega));
  const sinI = Math.sin(i);
  const k = v.radiusRatio;
  return {
    total: part(v.period, v.scaledSemiMajorAxis, 1 + k, b, sinI, factor),
    full: k < 1 ? part(v.period, v.scaledSemiMajorAxis, 1 - k, b, sinI, factor) : 0,
  };
}

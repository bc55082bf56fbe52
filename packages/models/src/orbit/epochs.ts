/**
 * Conversions between the time of inferior conjunction tc (mid-transit) and the time
 * of periastron tp. Times in days relative to the caller's float64 reference epoch.
 *
 * M(t) = 2 pi (t - tc) / P + M_c, so tp = tc - P M_c / (2 pi), with M_c the mean anomaly
 * at conjunction in [-pi, pi]: the periastron passage returned is the one nearest to tc
 * (within half a period).
 */
import { z } from 'zod';
import { conjunctionMeanAnomalyUnchecked } from './anomalies.js';
import { OrbitParameterError } from './errors.js';

const epochInput = z.object({
  period: z.number().finite().positive(),
  eccentricity: z.number().min(0).lt(1),
  omega: z.number().finite(),
});

function parseOrbit(input: { period: number; eccentricity: number; omega: number }, time: number, timeField: string): void {
  const r = epochInput.safeParse(input);
  if (!r.success) {
    const issue = r.error.issues[0];
    const field = String(issue.path[0] ?? 'input');
    const expected = field === 'period' ? 'a finite positive number (days)' : field === 'eccentricity' ? 'a number in [0, 1)' : 'a finite number (radians)';
    throw new OrbitParameterError(field, (input as Record<string, unknown>)[field], expected);
  }
  if (!Number.isFinite(time)) throw new OrbitParameterError(timeField, time, 'a finite number (days)');
}

/** Orbit elements needed to relate the two epochs. */
export interface EpochOrbit {
  /** Orbital period, days. */
  period: number;
  /** Eccentricity, 0 <= e < 1. */
  eccentricity: number;
  /** Argument of periastron, radians (Winn 2010 convention). */
  omega: number;
}

/** Time of periastron (days) nearest to the given time of inferior conjunction `tc` (days). */
export function periastronTimeFromConjunction(tc: number, orbit: EpochOrbit): number {
  parseOrbit(orbit, tc, 'tc');
  const Mc = conjunctionMeanAnomalyUnchecked(orbit.eccentricity, orbit.omega);
  return tc - (orbit.period * Mc) / (2 * Math.PI);
}

/** Time of inferior conjunction (days) nearest to the given time of periastron `tp` (days). */
export function conjunctionTimeFromPeriastron(tp: number, orbit: EpochOrbit): number {
  parseOrbit(orbit, tp, 'tp');
  const Mc = conjunctionMeanAnomalyUnchecked(orbit.eccentricity, orbit.omega);
  return tp + (orbit.period * Mc) / (2 * Math.PI);
}

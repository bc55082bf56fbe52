/**
 * The physical parameter vector Φ of a planetary system, in float64: every quantity the
 * likelihood needs, whether sampled or held fixed, at a fixed slot. Slots are -1 where a
 * quantity is absent (no radial velocities, no light curves, circular orbits included:
 * their eccentricity vector is present and fixed at zero).
 *
 * Units: periods and times in days (times relative to the reference epoch), velocities
 * in m/s, impact parameters in stellar radii, stellar density in g/cm³, stellar mass and
 * radius in nominal solar units, fluxes in the data's units.
 */
export interface PhysicalLayout {
  readonly length: number;
  /** Per planet. */
  readonly period: Int32Array;
  readonly tc: Int32Array;
  /** First of the two slots (√e cos ω, √e sin ω). */
  readonly eccentricity: Int32Array;
  /** Semi-amplitude K; -1 for a planet not in the radial velocities. */
  readonly semiAmplitude: Int32Array;
  /** Radius ratio k; -1 for a planet not transiting. */
  readonly radiusRatio: Int32Array;
  /** Impact parameter b; -1 for a planet not transiting. */
  readonly impact: Int32Array;
  /** a/R_* per planet in the scaled-axis geometry, else -1. */
  readonly scaledAxis: Int32Array;
  /** Stellar density (density geometry with a transiting planet), else -1. */
  readonly density: number;
  readonly starMass: number;
  readonly starRadius: number;
  /** Per instrument. */
  readonly offset: Int32Array;
  readonly jitter: Int32Array;
  /** Trend coefficients, degree 1 then 2. */
  readonly trend: Int32Array;
  /** Per band: (q1, q2) or (u1, u2). */
  readonly limbFirst: Int32Array;
  readonly limbSecond: Int32Array;
  /** Per light curve. */
  readonly baseline: Int32Array;
  readonly fluxJitter: Int32Array;
  /** -1 where no dilution is fitted. */
  readonly dilution: Int32Array;
}

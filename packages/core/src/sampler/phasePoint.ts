/**
 * A point of the Hamiltonian flow, stored in preallocated typed arrays so that the
 * integrator never allocates. `velocity` is M⁻¹ p and `scaledGradient` is M⁻¹ ∇log p,
 * kept so that each leapfrog step costs one product with M⁻¹.
 */
export interface PhasePoint {
  readonly position: Float64Array;
  readonly momentum: Float64Array;
  readonly velocity: Float64Array;
  readonly gradient: Float64Array;
  readonly scaledGradient: Float64Array;
  /** log p(position), up to the target's constant. */
  logDensity: number;
  /** ½ pᵀ M⁻¹ p. */
  kinetic: number;
}

/** A phase point of dimension `dim`, filled with zeros. */
export function createPhasePoint(dim: number): PhasePoint {
  return {
    position: new Float64Array(dim),
    momentum: new Float64Array(dim),
    velocity: new Float64Array(dim),
    gradient: new Float64Array(dim),
    scaledGradient: new Float64Array(dim),
    logDensity: 0,
    kinetic: 0,
  };
}

/** Copies every field of `from` into `to`. */
export function copyPhasePoint(from: PhasePoint, to: PhasePoint): void {
  to.position.set(from.position);
  to.momentum.set(from.momentum);
  to.velocity.set(from.velocity);
  to.gradient.set(from.gradient);
  to.scaledGradient.set(from.scaledGradient);
  to.logDensity = from.logDensity;
  to.kinetic = from.kinetic;
}

/** The Hamiltonian H = −log p + ½ pᵀ M⁻¹ p of a phase point (NaN-propagating). */
export function hamiltonian(point: PhasePoint): number {
  return point.kinetic - point.logDensity;
}

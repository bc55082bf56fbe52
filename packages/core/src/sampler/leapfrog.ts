import type { Target } from '../target.js';
import { applyInverseMass, type Metric } from './metric.js';
import type { PhasePoint } from './phasePoint.js';

/**
 * One leapfrog (Störmer–Verlet) step of size `stepSize` (negative integrates
 * backward in time), in place on `point`:
 * p ← p + ε/2 ∇log p(q); q ← q + ε M⁻¹ p; p ← p + ε/2 ∇log p(q).
 *
 * The velocity M⁻¹ p is updated linearly through the stored M⁻¹ ∇log p, so each step
 * costs one gradient and one product with M⁻¹ and allocates nothing. Non-finite
 * values propagate into `logDensity`/`kinetic` for the caller to flag as divergent.
 */
export function leapfrogStep(
  target: Target,
  metric: Metric,
  stepSize: number,
  point: PhasePoint,
): void {
  const n = point.position.length;
  const q = point.position;
  const p = point.momentum;
  const v = point.velocity;
  const g = point.gradient;
  const mg = point.scaledGradient;
  const half = 0.5 * stepSize;
  for (let i = 0; i < n; i++) {
    p[i] += half * g[i];
    const vi = v[i] + half * mg[i];
    v[i] = vi;
    q[i] += stepSize * vi;
  }
  const logDensity = target.logDensityGrad(q, g);
  applyInverseMass(metric, g, mg);
  let twiceKinetic = 0;
  for (let i = 0; i < n; i++) {
    const pi = p[i] + half * g[i];
    const vi = v[i] + half * mg[i];
    p[i] = pi;
    v[i] = vi;
    twiceKinetic += pi * vi;
  }
  point.logDensity = logDensity;
  point.kinetic = 0.5 * twiceKinetic;
}

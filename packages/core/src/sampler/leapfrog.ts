import type { Target } from '../target.js';
import { applyInverseMass, type Metric } from './metric.js';
import type { PhasePoint } from './phasePoint.js';

/**
 * One leapfrog (Störmer–Verlet) step of size `stepSize` (negative integrates
 * backward in time), in place on `point`:
 * p ← p + ε/2 ∇log p(q); q ← q + ε M⁻¹ p; p ← p + ε/2 ∇log p(q).
 * Afterwards `velocity` = M⁻¹ p and `kinetic` = ½ pᵀ M⁻¹ p at the new point.
 *
 * Unit and diagonal metrics fold M⁻¹ into the two update loops. For a dense metric
 * the velocity is updated linearly through the stored M⁻¹ ∇log p
 * (`scaledGradient`, which the caller must have set at the start point), so each step
 * costs one gradient and one product with M⁻¹. Nothing is allocated. Non-finite
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
  const half = 0.5 * stepSize;
  let twiceKinetic = 0;
  if (metric.kind === 'diagonal') {
    const m = metric.inverseMass;
    for (let i = 0; i < n; i++) {
      const pi = p[i] + half * g[i];
      p[i] = pi;
      q[i] += stepSize * m[i] * pi;
    }
    point.logDensity = target.logDensityGrad(q, g);
    for (let i = 0; i < n; i++) {
      const pi = p[i] + half * g[i];
      const vi = m[i] * pi;
      p[i] = pi;
      v[i] = vi;
      twiceKinetic += pi * vi;
    }
  } else if (metric.kind === 'unit') {
    for (let i = 0; i < n; i++) {
      const pi = p[i] + half * g[i];
      p[i] = pi;
      q[i] += stepSize * pi;
    }
    point.logDensity = target.logDensityGrad(q, g);
    for (let i = 0; i < n; i++) {
      const pi = p[i] + half * g[i];
      p[i] = pi;
      v[i] = pi;
      twiceKinetic += pi * pi;
    }
  } else {
    const mg = point.scaledGradient;
    for (let i = 0; i < n; i++) {
      p[i] += half * g[i];
      const vi = v[i] + half * mg[i];
      v[i] = vi;
      q[i] += stepSize * vi;
    }
    point.logDensity = target.logDensityGrad(q, g);
    applyInverseMass(metric, g, mg);
    for (let i = 0; i < n; i++) {
      const pi = p[i] + half * g[i];
      const vi = v[i] + half * mg[i];
      p[i] = pi;
      v[i] = vi;
      twiceKinetic += pi * vi;
    }
  }
  point.kinetic = 0.5 * twiceKinetic;
}

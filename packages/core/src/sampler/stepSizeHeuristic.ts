import type { RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import { leapfrogStep } from './leapfrog.js';
import { applyInverseMass, drawMomentum, kineticEnergy, type Metric } from './metric.js';
import { copyPhasePoint, type PhasePoint } from './phasePoint.js';

/** Doublings or halvings at most before the heuristic gives up and returns what it has. */
const maxHeuristicSteps = 60;

/**
 * Heuristic initial step size (Hoffman & Gelman 2014, algorithm 4): from `stepSize`,
 * double (or halve) ε while one leapfrog step's acceptance ratio stays above (below) 1/2,
 * with one momentum draw. A non-finite energy counts as acceptance 0. `start` must hold
 * the position, gradient and log-density; `start` and `trial` are used as scratch.
 */
export function heuristicStepSize(
  target: Target,
  metric: Metric,
  rng: RandomStream,
  stepSize: number,
  start: PhasePoint,
  trial: PhasePoint,
): number {
  applyInverseMass(metric, start.gradient, start.scaledGradient);
  drawMomentum(metric, rng, start.momentum, start.velocity);
  start.kinetic = kineticEnergy(start.momentum, start.velocity);
  const h0 = start.kinetic - start.logDensity;
  const logHalf = -Math.LN2;
  const logRatio = (eps: number): number => {
    copyPhasePoint(start, trial);
    leapfrogStep(target, metric, eps, trial);
    const d = h0 - (trial.kinetic - trial.logDensity);
    return Number.isNaN(d) ? -Infinity : d;
  };
  let eps = stepSize;
  const up = logRatio(eps) > logHalf;
  for (let k = 0; k < maxHeuristicSteps; k++) {
    const next = up ? 2 * eps : 0.5 * eps;
    if (!Number.isFinite(next) || next === 0) break;
    eps = next;
    const r = logRatio(eps);
    if (up ? !(r > logHalf) : !(r < logHalf)) break;
  }
  return eps;
}

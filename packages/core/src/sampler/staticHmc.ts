import type { RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import type { ChainPoint } from './chainPoint.js';
import { leapfrogStep } from './leapfrog.js';
import { applyInverseMass, drawMomentum, kineticEnergy, type Metric } from './metric.js';
import { divergenceThreshold } from './nuts.js';
import { createPhasePoint, type PhasePoint } from './phasePoint.js';
import type { TransitionStats } from './transitionStats.js';

/** Length of a static HMC trajectory: a fixed number of steps or a path length. */
export type StaticPath =
  | { readonly steps: number }
  | { /** Integration time ε·L, in the target's coordinates per unit momentum. */ readonly pathLength: number };

/** Preallocated buffers for static HMC in `dim` dimensions. */
export interface HmcWorkspace {
  readonly dim: number;
  readonly point: PhasePoint;
}

/** Buffers for static HMC in `dim` dimensions. */
export function createHmcWorkspace(dim: number): HmcWorkspace {
  return { dim, point: createPhasePoint(dim) };
}

/**
 * One static-path HMC transition (Duane et al. 1987; Neal 2011, "MCMC using
 * Hamiltonian dynamics"): a momentum draw, L leapfrog steps, then a Metropolis
 * accept/reject on the energy error. With `jitter` = j > 0 the step size is drawn
 * uniformly from ε·(1 − j, 1 + j) for each transition. With a path length T the
 * number of steps is max(1, round(T / ε)). A trajectory whose energy error exceeds
 * 1000 or turns non-finite is stopped, counted divergent and rejected.
 *
 * Moves `current` in place when the proposal is accepted.
 */
export function hmcTransition(
  target: Target,
  metric: Metric,
  rng: RandomStream,
  stepSize: number,
  path: StaticPath,
  jitter: number,
  current: ChainPoint,
  ws: HmcWorkspace,
): TransitionStats {
  const eps = jitter > 0 ? stepSize * (1 + jitter * (2 * rng.uniform() - 1)) : stepSize;
  const steps = 'steps' in path ? path.steps : Math.max(1, Math.round(path.pathLength / eps));
  const z = ws.point;
  z.position.set(current.position);
  z.gradient.set(current.gradient);
  z.logDensity = current.logDensity;
  applyInverseMass(metric, z.gradient, z.scaledGradient);
  drawMomentum(metric, rng, z.momentum, z.velocity);
  z.kinetic = kineticEnergy(z.momentum, z.velocity);
  const h0 = z.kinetic - z.logDensity;
  let divergent = false;
  let taken = 0;
  let energyError = 0;
  for (let s = 0; s < steps; s++) {
    leapfrogStep(target, metric, eps, z);
    taken += 1;
    energyError = z.kinetic - z.logDensity - h0;
    if (!(energyError <= divergenceThreshold)) {
      divergent = true;
      break;
    }
  }
  const acceptance = divergent ? 0 : energyError > 0 ? Math.exp(-energyError) : 1;
  const accept = !divergent && (energyError <= 0 || rng.uniform() < acceptance);
  if (accept) {
    current.position.set(z.position);
    current.gradient.set(z.gradient);
    current.logDensity = z.logDensity;
  }
  return {
    stepSize: eps,
    treeDepth: 0,
    leapfrogSteps: taken,
    divergent,
    energy: accept ? h0 + energyError : h0,
    acceptance,
    logDensity: current.logDensity,
  };
}

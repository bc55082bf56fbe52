/**
 * Dual-averaging step-size adaptation (Hoffman & Gelman 2014, JMLR 15, 1593, sec. 3.2,
 * eq. 6 and algorithm 5). All fields are plain numbers so the state serialises as JSON.
 */
export interface DualAveragingState {
  /** Shrinkage point: μ = log(10 ε₀) at the start, log ε₀ after a re-centring. */
  mu: number;
  /** log ε of the current iterate. */
  logStepSize: number;
  /** log ε̄, the weighted average of the iterates (used after warmup). */
  logStepSizeAverage: number;
  /** H̄, the running average of (target acceptance − acceptance). */
  acceptanceGap: number;
  /** Number of updates m since the last (re)start; sets the average's weight m^−κ. */
  count: number;
  /**
   * Updates made before the last re-centring ({@link recentreDualAveraging}); they
   * still count in the gain √(m + m₀)/γ and in the weight 1/(m + m₀ + t₀) of H̄.
   * 0 after {@link startDualAveraging}.
   */
  priorUpdates: number;
}

/** Constants of dual averaging: γ, t₀ and κ of Hoffman & Gelman (2014). */
export interface DualAveragingConstants {
  readonly gamma: number;
  readonly t0: number;
  readonly kappa: number;
}

/** The constants recommended by Hoffman & Gelman (2014, sec. 3.2): γ = 0.05, t₀ = 10, κ = 0.75. */
export const defaultDualAveragingConstants: DualAveragingConstants = Object.freeze({
  gamma: 0.05,
  t0: 10,
  kappa: 0.75,
});

/** A fresh dual-averaging state starting at step size `stepSize`, with μ = log(10 ε). */
export function startDualAveraging(stepSize: number): DualAveragingState {
  const logStepSize = Math.log(stepSize);
  return {
    mu: Math.log(10) + logStepSize,
    logStepSize,
    logStepSizeAverage: 0,
    acceptanceGap: 0,
    count: 0,
    priorUpdates: 0,
  };
}

/**
 * Dual averaging moved to a new step size `stepSize` after the metric changed,
 * without forgetting how far it has come: μ = log ε (not log 10ε), H̄ and the average
 * start afresh, and the updates made so far keep counting in the gain.
 *
 * Why: Hoffman & Gelman's gain √m/γ · 1/(m + t₀) is largest for small m, about 3 per
 * unit of acceptance gap at m = 10–50, so a full restart after each metric update sends
 * the step size swinging by factors of 10 within a few iterations (0.03 to 0.4 on the
 * demo's model). Each swing down costs a saturated tree; and since the acceptance
 * falls concavely with log ε, the average ε̄ of such swings lands well below the step
 * size that meets the target: after the 50-iteration terminal interval the demo's
 * chains sampled at acceptance 0.92 for a target of 0.8, with 26–28 leapfrog steps per
 * draw. Re-centred, the gain stays at the level the warmup had reached (about 0.9 at
 * m = 500) and the same chains sample at 0.81–0.85 with 15–18 steps per draw.
 */
export function recentreDualAveraging(state: DualAveragingState, stepSize: number): DualAveragingState {
  const logStepSize = Math.log(stepSize);
  return {
    mu: logStepSize,
    logStepSize,
    logStepSizeAverage: 0,
    acceptanceGap: 0,
    count: 0,
    priorUpdates: state.priorUpdates + state.count,
  };
}

/**
 * One dual-averaging update with the acceptance statistic of the last transition
 * (a non-finite value counts as 0). Mutates `state`; returns the next step size.
 */
export function updateDualAveraging(
  state: DualAveragingState,
  acceptance: number,
  targetAcceptance: number,
  constants: DualAveragingConstants = defaultDualAveragingConstants,
): number {
  const alpha = Number.isFinite(acceptance) ? Math.min(1, Math.max(0, acceptance)) : 0;
  const m = state.count + 1;
  const total = m + state.priorUpdates;
  const w = 1 / (total + constants.t0);
  state.acceptanceGap = (1 - w) * state.acceptanceGap + w * (targetAcceptance - alpha);
  state.logStepSize = state.mu - (Math.sqrt(total) / constants.gamma) * state.acceptanceGap;
  const eta = Math.pow(m, -constants.kappa);
  state.logStepSizeAverage = eta * state.logStepSize + (1 - eta) * state.logStepSizeAverage;
  state.count = m;
  return Math.exp(state.logStepSize);
}

/** The averaged step size ε̄ = exp(log ε̄) to use after warmup. */
export function averagedStepSize(state: DualAveragingState): number {
  return Math.exp(state.logStepSizeAverage);
}

/**
 * Dual-averaging step-size adaptation (Hoffman & Gelman 2014, JMLR 15, 1593, sec. 3.2,
 * eq. 6 and algorithm 5). All fields are plain numbers so the state serialises as JSON.
 */
export interface DualAveragingState {
  /** Shrinkage point μ = log(10 ε₀). */
  mu: number;
  /** log ε of the current iterate. */
  logStepSize: number;
  /** log ε̄, the weighted average of the iterates (used after warmup). */
  logStepSizeAverage: number;
  /** H̄, the running average of (target acceptance − acceptance). */
  acceptanceGap: number;
  /** Number of updates m since the last restart. */
  count: number;
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
  const w = 1 / (m + constants.t0);
  state.acceptanceGap = (1 - w) * state.acceptanceGap + w * (targetAcceptance - alpha);
  state.logStepSize = state.mu - (Math.sqrt(m) / constants.gamma) * state.acceptanceGap;
  const eta = Math.pow(m, -constants.kappa);
  state.logStepSizeAverage = eta * state.logStepSize + (1 - eta) * state.logStepSizeAverage;
  state.count = m;
  return Math.exp(state.logStepSize);
}

/** The averaged step size ε̄ = exp(log ε̄) to use after warmup. */
export function averagedStepSize(state: DualAveragingState): number {
  return Math.exp(state.logStepSizeAverage);
}

/**
 * Effective sample size from per-chain autocovariances, combined across chains as in
 * Vehtari, Gelman, Simpson, Carpenter & Bürkner (2021, Bayesian Analysis 16, 667),
 * with Geyer's (1992, Statistical Science 7, 473) initial monotone sequence.
 *
 * With M chains of N draws, chain variances s_m^2 (divisor N-1), W = mean s_m^2,
 * B/N = variance of the chain means (divisor M-1) and var+ = (N-1)/N W + B/N:
 *   rho_t = 1 - (W - mean_m s_m^2 rho_{t,m}) / var+,
 * where s_m^2 rho_{t,m} = acov_m(t) N/(N-1) for the divisor-N autocovariance acov_m.
 * Pairs P_k = rho_{2k} + rho_{2k+1} are summed while positive and forced non-increasing;
 * tau = -1 + 2 sum_k P_k and ESS = M N / tau.
 *
 * Safeguard (our choice, recalled from the paper's accompanying code, "from memory"): tau is
 * kept ≥ 1/log10(M N), so a noisy antithetic estimate cannot exceed M N log10(M N).
 */

/** Result of the autocorrelation sum. */
export interface GeyerResult {
  /** Effective sample size (NaN when the within-chain variance is zero). */
  readonly ess: number;
  /** Integrated autocorrelation time tau (ESS = M N / tau). */
  readonly tau: number;
  /** Largest lag used. */
  readonly lastLag: number;
  /** False when the positive-pair sequence had not ended at the largest lag available. */
  readonly terminated: boolean;
}

/** Chain means and divisor-N autocovariances (lags 0..length-1 available) of M chains of N draws. */
export interface ChainMoments {
  readonly chains: number;
  readonly draws: number;
  readonly means: ArrayLike<number>;
  readonly acov: readonly ArrayLike<number>[];
}

/** Within-chain variance W, and var+ (Vehtari et al. 2021). */
export function varianceComponents(chains: number, draws: number, means: ArrayLike<number>, chainVariances: ArrayLike<number>): { within: number; plus: number } {
  let w = 0;
  let grand = 0;
  for (let m = 0; m < chains; m++) {
    w += chainVariances[m];
    grand += means[m];
  }
  w /= chains;
  grand /= chains;
  let between = 0; // this is B / N
  if (chains > 1) {
    for (let m = 0; m < chains; m++) between += (means[m] - grand) ** 2;
    between /= chains - 1;
  }
  return { within: w, plus: ((draws - 1) / draws) * w + between };
}

/** The multi-chain autocorrelation rho_t as a function of the per-chain lag-t autocovariances. */
export interface CombinedCorrelation {
  readonly chains: number;
  readonly draws: number;
  readonly within: number;
  readonly plus: number;
  /** N / (N - 1). */
  readonly scale: number;
}

/** Sets up rho_t from chain means and lag-0 autocovariances (divisor N). */
export function combinedCorrelation(chains: number, draws: number, means: ArrayLike<number>, lagZero: ArrayLike<number>): CombinedCorrelation {
  const scale = draws / (draws - 1);
  const variances = new Float64Array(chains);
  for (let m = 0; m < chains; m++) variances[m] = lagZero[m] * scale;
  const { within, plus } = varianceComponents(chains, draws, means, variances);
  return { chains, draws, within, plus, scale };
}

/** rho_t of the combination, from the per-chain autocovariances at lag t. */
export function correlationAt(c: CombinedCorrelation, acov: readonly ArrayLike<number>[], t: number): number {
  if (t === 0) return 1;
  let s = 0;
  for (let m = 0; m < c.chains; m++) s += acov[m][t];
  return 1 - (c.within - (s / c.chains) * c.scale) / c.plus;
}

/** Progress of Geyer's initial monotone sequence; advance it as lags become available. */
export interface GeyerState {
  sum: number;
  previous: number;
  /** Next even lag to consume. */
  nextLag: number;
  done: boolean;
}

export function startGeyer(): GeyerState {
  return { sum: 0, previous: Infinity, nextLag: 0, done: false };
}

/**
 * Consumes lag pairs (t, t+1) while t + 1 ≤ lastLag. Marks the state done when a pair is
 * not positive or when the chains' own last lag (draws - 1) has been reached.
 */
export function advanceGeyer(state: GeyerState, c: CombinedCorrelation, acov: readonly ArrayLike<number>[], lastLag: number): void {
  while (!state.done && state.nextLag + 1 <= lastLag) {
    const t = state.nextLag;
    let pair = correlationAt(c, acov, t) + correlationAt(c, acov, t + 1);
    if (!(pair > 0)) {
      state.done = true;
      break;
    }
    if (pair > state.previous) pair = state.previous;
    state.sum += pair;
    state.previous = pair;
    state.nextLag = t + 2;
  }
  if (state.nextLag + 1 > c.draws - 1) state.done = true;
}

/** ESS and tau from a finished (or abandoned) sequence. */
export function finishGeyer(state: GeyerState, c: CombinedCorrelation): GeyerResult {
  const total = c.chains * c.draws;
  if (!(c.within > 0) || !(c.plus > 0)) return { ess: NaN, tau: NaN, lastLag: 0, terminated: true };
  let tau = -1 + 2 * state.sum;
  const floor = 1 / Math.log10(total);
  if (tau < floor) tau = floor;
  return { ess: total / tau, tau, lastLag: Math.max(0, state.nextLag - 1), terminated: state.done };
}

/** Combines per-chain autocovariances into an ESS (see module comment). */
export function essFromAutocovariances(moments: ChainMoments): GeyerResult {
  const { chains, draws, means, acov } = moments;
  const lagZero = new Float64Array(chains);
  let available = draws - 1;
  for (let m = 0; m < chains; m++) {
    lagZero[m] = acov[m][0];
    available = Math.min(available, acov[m].length - 1);
  }
  const c = combinedCorrelation(chains, draws, means, lagZero);
  const state = startGeyer();
  if (c.within > 0 && c.plus > 0) advanceGeyer(state, c, acov, available);
  return finishGeyer(state, c);
}

/**
 * Running mean and (co)variance of positions by Welford's (1962) algorithm, as
 * plain typed arrays. `m2` holds the sums of squared deviations: `dim` entries for
 * the diagonal kind, `dim × dim` row-major for the dense kind.
 */
export interface WelfordState {
  readonly kind: 'diagonal' | 'dense';
  readonly dim: number;
  count: number;
  readonly mean: Float64Array;
  readonly m2: Float64Array;
  /** Scratch for the deviation from the old mean (dense kind). */
  readonly delta: Float64Array;
}

/** An empty accumulator. */
export function createWelford(kind: 'diagonal' | 'dense', dim: number): WelfordState {
  return {
    kind,
    dim,
    count: 0,
    mean: new Float64Array(dim),
    m2: new Float64Array(kind === 'dense' ? dim * dim : dim),
    delta: new Float64Array(dim),
  };
}

/** Empties the accumulator in place. */
export function resetWelford(state: WelfordState): void {
  state.count = 0;
  state.mean.fill(0);
  state.m2.fill(0);
}

/** Adds one position. */
export function addToWelford(state: WelfordState, x: Float64Array): void {
  const n = state.dim;
  state.count += 1;
  const inv = 1 / state.count;
  const mean = state.mean;
  const m2 = state.m2;
  if (state.kind === 'diagonal') {
    for (let i = 0; i < n; i++) {
      const d = x[i] - mean[i];
      mean[i] += d * inv;
      m2[i] += d * (x[i] - mean[i]);
    }
    return;
  }
  const delta = state.delta;
  for (let i = 0; i < n; i++) {
    delta[i] = x[i] - mean[i];
    mean[i] += delta[i] * inv;
  }
  for (let i = 0; i < n; i++) {
    const ai = x[i] - mean[i];
    const row = i * n;
    for (let j = 0; j <= i; j++) m2[row + j] += ai * delta[j];
  }
}

/** A dense window needs at least this many draws per dimension for off-diagonal terms. */
export const denseMinimumDrawsPerDim = 2;

/**
 * How far a dense window's correlations are shrunk toward zero: the intensity λ of
 * Schäfer & Strimmer (2005, Stat. Appl. Genet. Mol. Biol. 4, art. 32; their target D,
 * "diagonal, unequal variance", listed in their table 1; from memory):
 * λ = Σ_{i≠j} Var(r_ij) / Σ_{i≠j} r_ij², clipped to [0, 1], with r the sample
 * correlations. Var(r_ij) is taken as (1 − r_ij²)² / (n − 1), the large-sample variance
 * of a correlation coefficient of normal data (from memory), because the accumulator
 * keeps sums of products, not the draws. Correlations that are noise (a short window
 * against the dimension) give λ near 1; strong ones measured with many draws, λ near 0.
 * Returns 1 when there are fewer than 3 positions or no off-diagonal terms.
 */
export function correlationShrinkage(state: WelfordState): number {
  const n = state.count;
  const d = state.dim;
  if (state.kind !== 'dense' || n < 3 || d < 2) return 1;
  const m2 = state.m2;
  let noise = 0;
  let signal = 0;
  for (let i = 1; i < d; i++) {
    for (let j = 0; j < i; j++) {
      const denom = Math.sqrt(m2[i * d + i] * m2[j * d + j]);
      // A coordinate that did not move carries no correlation to estimate.
      if (!(denom > 0)) continue;
      const r = m2[i * d + j] / denom;
      noise += (1 - r * r) ** 2 / (n - 1);
      signal += r * r;
    }
  }
  if (!(signal > 0)) return 1;
  return Math.min(1, Math.max(0, noise / signal));
}

/**
 * The sample (co)variance shrunk toward a small multiple of the identity:
 * (n / (n + 5)) · S + 1e-3 · (5 / (n + 5)) · I, with S the unbiased estimate.
 * This keeps early, short windows well conditioned (common practice in adaptive HMC).
 * Diagonal kind: `dim` variances; dense kind: the full symmetric `dim × dim` matrix,
 * with `shrinkCorrelations` its off-diagonal terms first shrunk toward zero by the
 * factor (1 − λ) of {@link correlationShrinkage}. The warmup shrinks every window but
 * the last: on the demo's joint model (23 coordinates) the 50- and 100-draw windows of a
 * 1000-iteration warmup otherwise gave metrics that cost 53–59 leapfrog steps per
 * iteration in the window after, against 34–36 with it. The last window, whose metric
 * sampling uses, is not shrunk: λ is the intensity that is best for the covariance's
 * entries, not for preconditioning, and on a 100-D Gaussian with condition number 1e4
 * (λ about d/n of the window) it inflated the smallest variances so much that ESS per
 * gradient fell from 0.085 to 0.019 (`pnpm bench`, 2026-12-02).
 *
 * Dense kind with fewer than {@link denseMinimumDrawsPerDim}·dim positions: the
 * off-diagonal terms are dropped. Such a window cannot estimate a full covariance:
 * with n ≤ dim draws S is singular, and even at n = 2·dim its eigenvalues spread by a
 * factor of about 30 for an identity covariance (Marchenko & Pastur 1967), which
 * would force tiny steps and saturated trees until the next window.
 * Returns null when fewer than 2 positions were added.
 */
export function regularisedCovariance(state: WelfordState, shrinkCorrelations = false): Float64Array | null {
  const n = state.count;
  if (n < 2) return null;
  const d = state.dim;
  const scale = n / ((n + 5) * (n - 1));
  const ridge = 1e-3 * (5 / (n + 5));
  if (state.kind === 'diagonal') {
    const out = new Float64Array(d);
    for (let i = 0; i < d; i++) out[i] = scale * state.m2[i] + ridge;
    return out;
  }
  const out = new Float64Array(d * d);
  const full = n >= denseMinimumDrawsPerDim * d;
  const keep = !full ? 0 : shrinkCorrelations ? 1 - correlationShrinkage(state) : 1;
  for (let i = 0; i < d; i++) {
    for (let j = 0; j < i; j++) {
      const v = keep === 0 ? 0 : keep * scale * state.m2[i * d + j];
      out[i * d + j] = v;
      out[j * d + i] = v;
    }
    out[i * d + i] = scale * state.m2[i * d + i] + ridge;
  }
  return out;
}

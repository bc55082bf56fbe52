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
 * The sample (co)variance shrunk toward a small multiple of the identity:
 * (n / (n + 5)) · S + 1e-3 · (5 / (n + 5)) · I, with S the unbiased estimate.
 * This keeps early, short windows well conditioned (common practice in adaptive HMC).
 * Diagonal kind: `dim` variances; dense kind: the full symmetric `dim × dim` matrix.
 *
 * Dense kind with fewer than {@link denseMinimumDrawsPerDim}·dim positions: the
 * off-diagonal terms are dropped. Such a window cannot estimate a full covariance:
 * with n ≤ dim draws S is singular, and even at n = 2·dim its eigenvalues spread by a
 * factor of about 30 for an identity covariance (Marchenko & Pastur 1967), which
 * would force tiny steps and saturated trees until the next window.
 * Returns null when fewer than 2 positions were added.
 */
export function regularisedCovariance(state: WelfordState): Float64Array | null {
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
  for (let i = 0; i < d; i++) {
    for (let j = full ? 0 : i; j <= i; j++) {
      const v = scale * state.m2[i * d + j];
      out[i * d + j] = v;
      out[j * d + i] = v;
    }
    out[i * d + i] += ridge;
  }
  return out;
}

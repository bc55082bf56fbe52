/**
 * Adaptive random-walk Metropolis (Haario, Saksman & Tamminen 2001, Bernoulli 7, 223),
 * written for the benchmarks only: the gradient-free baseline NUTS is compared with.
 *
 * Proposal: x' ~ N(x, C_t) with C_t = s_d (Cov(x_0..x_{t-1}) + eps I), s_d = 2.4^2 / d
 * (their eq. 2.1, the scaling of Gelman, Roberts & Gilks 1996), and C_t = C_0 for
 * t <= t0. C_0 defaults to s_d I, the optimal proposal for a unit-covariance target:
 * the same starting guess as the identity metric NUTS starts from. The running
 * covariance of the whole history is updated every iteration (Welford); its Cholesky
 * factor is refreshed every `refresh` iterations, since an O(d^3) factorisation per step
 * would dominate the cost at d = 100 without changing what the chain converges to
 * (common practice). A factorisation that fails (not numerically positive definite)
 * keeps the previous factor.
 *
 * The run stops after `maxIterations` or when `clock()` has advanced by `seconds`,
 * whichever comes first, so that it can be given the same time budget as another
 * sampler. Draws after the first `burnInFraction` of the iterations are kept, thinned
 * by a factor that doubles whenever the buffer of `capacity` draws fills (so memory is
 * bounded whatever the run length); the thinning factor is reported. Thinning by k loses
 * little ESS when k is much smaller than the chain's integrated autocorrelation time,
 * which for random-walk Metropolis in d dimensions is of order d iterations or more.
 */
import seedrandom from 'seedrandom';

export interface LogDensity {
  dim: number;
  /** Only the value is used; the gradient argument is a scratch buffer. */
  logDensityGrad(x: Float64Array, grad: Float64Array): number;
}

export interface AdaptiveMetropolisOptions {
  /** Seed text or number of this chain's random stream (seedrandom's alea). */
  seed: number | string;
  /** Start of the chain (length dim). */
  init: ArrayLike<number>;
  /** Time budget, in units of `clock` (seconds). */
  seconds: number;
  /** Clock in seconds; default process CPU time (user + system). */
  clock?: () => number;
  /** Upper bound on iterations (default: unbounded, the budget decides). */
  maxIterations?: number;
  /** Fraction of the iterations discarded as burn-in (default 0.5). */
  burnInFraction?: number;
  /** Maximum number of stored draws (default 4000); thinning doubles when it fills. */
  capacity?: number;
  /** Iterations with the fixed proposal C_0 before adaptation (default max(200, 2d)). */
  t0?: number;
  /** Iterations between Cholesky refreshes of the adapted proposal (default max(50, d)). */
  refresh?: number;
  /** Diagonal of C_0 (default s_d = 2.4^2 / d). */
  initialVariance?: number;
}

export interface AdaptiveMetropolisResult {
  /** Kept draws × dim, row-major, thinned by `thin`. */
  draws: Float64Array;
  kept: number;
  thin: number;
  iterations: number;
  /** Accepted proposals / iterations after burn-in. */
  acceptance: number;
  densityEvaluations: number;
  /** Elapsed time on `clock`. */
  seconds: number;
}

function processCpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/** Lower Cholesky factor of the n × n row-major `a` into `out`; false if not positive definite. */
function cholesky(a: Float64Array, d: number, out: Float64Array): boolean {
  out.fill(0);
  for (let j = 0; j < d; j++) {
    let s = a[j * d + j];
    for (let k = 0; k < j; k++) s -= out[j * d + k] * out[j * d + k];
    if (!(s > 0)) return false;
    const ljj = Math.sqrt(s);
    out[j * d + j] = ljj;
    for (let i = j + 1; i < d; i++) {
      let t = a[i * d + j];
      for (let k = 0; k < j; k++) t -= out[i * d + k] * out[j * d + k];
      out[i * d + j] = t / ljj;
    }
  }
  return true;
}

/** Runs one adaptive Metropolis chain on `target` within the time budget. */
export function runAdaptiveMetropolis(
  target: LogDensity,
  opts: AdaptiveMetropolisOptions,
): AdaptiveMetropolisResult {
  const d = target.dim;
  if (opts.init.length !== d) throw new RangeError(`init has length ${opts.init.length}: expected dim = ${d}`);
  const clock = opts.clock ?? processCpuSeconds;
  const rng = seedrandom.alea(String(opts.seed));
  let spare = NaN;
  const normal = (): number => {
    if (!Number.isNaN(spare)) {
      const s = spare;
      spare = NaN;
      return s;
    }
    let u = 0;
    let v = 0;
    let r = 0;
    do {
      u = 2 * rng() - 1;
      v = 2 * rng() - 1;
      r = u * u + v * v;
    } while (r >= 1 || r === 0);
    const f = Math.sqrt((-2 * Math.log(r)) / r);
    spare = v * f;
    return u * f;
  };
  const t0 = opts.t0 ?? Math.max(200, 2 * d);
  const refresh = opts.refresh ?? Math.max(50, d);
  const sd = (2.4 * 2.4) / d;
  const eps = 1e-8;
  const maxIterations = opts.maxIterations ?? Infinity;
  const burnIn = opts.burnInFraction ?? 0.5;
  const capacity = opts.capacity ?? 4000;
  const grad = new Float64Array(d);
  const x = Float64Array.from(opts.init);
  const prop = new Float64Array(d);
  const z = new Float64Array(d);
  const mean = new Float64Array(d);
  const m2 = new Float64Array(d * d);
  const cov = new Float64Array(d * d);
  const chol = new Float64Array(d * d);
  const trial = new Float64Array(d * d);
  const c0 = Math.sqrt(opts.initialVariance ?? sd);
  for (let i = 0; i < d; i++) chol[i * d + i] = c0;
  let lp = target.logDensityGrad(x, grad);
  let evals = 1;
  // All iterations are stored (thinned) first; burn-in is cut at the end, when the
  // number of iterations is known. Each stored draw remembers its iteration.
  const stored = new Float64Array(capacity * d);
  const storedAt = new Float64Array(capacity);
  const acceptedBefore = new Float64Array(capacity);
  let count = 0;
  let thin = 1;
  let accepted = 0;
  let n = 0;
  const start = clock();
  const deadline = start + opts.seconds;
  let it = 0;
  for (; it < maxIterations; it++) {
    if ((it & 15) === 0 && clock() > deadline) break;
    for (let i = 0; i < d; i++) z[i] = normal();
    for (let i = 0; i < d; i++) {
      let s = 0;
      const row = i * d;
      for (let k = 0; k <= i; k++) s += chol[row + k] * z[k];
      prop[i] = x[i] + s;
    }
    const lpProp = target.logDensityGrad(prop, grad);
    evals++;
    if (Number.isFinite(lpProp) && Math.log(rng()) < lpProp - lp) {
      x.set(prop);
      lp = lpProp;
      accepted++;
    }
    // Welford update of the running covariance of the whole history (lower triangle).
    n++;
    for (let i = 0; i < d; i++) {
      const di = x[i] - mean[i];
      mean[i] += di / n;
      const row = i * d;
      for (let j = 0; j <= i; j++) m2[row + j] += di * (x[j] - mean[j]);
    }
    if (n > t0 && n % refresh === 0) {
      for (let i = 0; i < d; i++) {
        for (let j = 0; j <= i; j++) {
          const c = (sd * m2[i * d + j]) / (n - 1);
          cov[i * d + j] = c;
          cov[j * d + i] = c;
        }
        cov[i * d + i] += sd * eps;
      }
      if (cholesky(cov, d, trial)) chol.set(trial);
    }
    if (it % thin === 0) {
      if (count === capacity) {
        // Keep every other stored draw and double the thinning.
        for (let k = 0; k < capacity / 2; k++) {
          stored.copyWithin(k * d, 2 * k * d, 2 * k * d + d);
          storedAt[k] = storedAt[2 * k];
          acceptedBefore[k] = acceptedBefore[2 * k];
        }
        count = capacity / 2;
        thin *= 2;
        if (it % thin !== 0) continue;
      }
      stored.set(x, count * d);
      storedAt[count] = it;
      acceptedBefore[count] = accepted;
      count++;
    }
  }
  const elapsed = clock() - start;
  const firstKept = Math.ceil(burnIn * it);
  let from = 0;
  while (from < count && storedAt[from] < firstKept) from++;
  const kept = count - from;
  const acceptedAfter = from < count ? accepted - acceptedBefore[from] : 0;
  return {
    draws: stored.slice(from * d, count * d),
    kept,
    thin,
    iterations: it,
    acceptance: from < count && it > storedAt[from] ? acceptedAfter / (it - storedAt[from]) : 0,
    densityEvaluations: evals,
    seconds: elapsed,
  };
}

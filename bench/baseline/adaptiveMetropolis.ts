/**
 * Adaptive random-walk Metropolis (Haario, Saksman & Tamminen 2001, Bernoulli 7, 223),
 * written for the benchmarks only: the gradient-free baseline NUTS is compared with.
 *
 * Proposal: x' ~ N(x, C_t) with C_t = s_d (Cov(x_0..x_{t-1}) + eps I), s_d = 2.4^2 / d
 * (their eq. 2.1), and C_t = C_0 = (0.1^2 / d) I for t <= t0. The running covariance is
 * updated every iteration (Welford); its Cholesky factor is refreshed every `refresh`
 * iterations, since an O(d^3) factorisation per step would dominate the cost at d = 100
 * without changing what the chain converges to (common practice).
 */
import seedrandom from 'seedrandom';

export interface LogDensity {
  dim: number;
  /** Only the value is used; the gradient argument is a scratch buffer. */
  logDensityGrad(x: Float64Array, grad: Float64Array): number;
}

export interface AdaptiveMetropolisOptions {
  seed: number;
  /** Iterations discarded as adaptation/burn-in. */
  warmup: number;
  /** Stop after this many kept draws or after `seconds` of wall-clock, whichever first. */
  maxDraws: number;
  seconds: number;
  init: Float64Array;
  t0?: number;
  refresh?: number;
}

export interface AdaptiveMetropolisResult {
  draws: Float64Array; // kept draws x dim, row-major
  kept: number;
  acceptance: number;
  densityEvaluations: number;
  seconds: number;
}

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

export function runAdaptiveMetropolis(
  target: LogDensity,
  opts: AdaptiveMetropolisOptions,
): AdaptiveMetropolisResult {
  const d = target.dim;
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
  const grad = new Float64Array(d);
  const x = Float64Array.from(opts.init);
  const prop = new Float64Array(d);
  const z = new Float64Array(d);
  const mean = new Float64Array(d);
  const m2 = new Float64Array(d * d);
  const cov = new Float64Array(d * d);
  const chol = new Float64Array(d * d);
  for (let i = 0; i < d; i++) chol[i * d + i] = 0.1 / Math.sqrt(d);
  let lp = target.logDensityGrad(x, grad);
  let evals = 1;
  let accepted = 0;
  let n = 0;
  const draws = new Float64Array(opts.maxDraws * d);
  let kept = 0;
  const start = performance.now();
  const deadline = start + opts.seconds * 1000;
  for (let it = 0; kept < opts.maxDraws; it++) {
    if ((it & 63) === 0 && performance.now() > deadline) break;
    for (let i = 0; i < d; i++) z[i] = normal();
    for (let i = 0; i < d; i++) {
      let s = 0;
      for (let k = 0; k <= i; k++) s += chol[i * d + k] * z[k];
      prop[i] = x[i] + s;
    }
    const lpProp = target.logDensityGrad(prop, grad);
    evals++;
    if (Number.isFinite(lpProp) && Math.log(rng()) < lpProp - lp) {
      x.set(prop);
      lp = lpProp;
      if (it >= opts.warmup) accepted++;
    }
    // Welford update of the running covariance of the whole history.
    n++;
    for (let i = 0; i < d; i++) {
      const di = x[i] - mean[i];
      mean[i] += di / n;
      for (let j = 0; j <= i; j++) m2[i * d + j] += di * (x[j] - mean[j]);
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
      cholesky(cov, d, chol);
    }
    if (it >= opts.warmup) {
      draws.set(x, kept * d);
      kept++;
    }
  }
  return {
    draws: draws.subarray(0, kept * d),
    kept,
    acceptance: kept > 0 ? accepted / kept : 0,
    densityEvaluations: evals,
    seconds: (performance.now() - start) / 1000,
  };
}

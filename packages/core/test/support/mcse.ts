/**
 * Small Monte Carlo error helpers for the sampler's tests, independent of the
 * diagnostics package so the sampler can be validated on its own.
 *
 * ESS: multi-chain autocorrelation estimate of Gelman et al. (BDA3, 2013, sec. 11.5,
 * eqs. 11.7–11.8, as restated by Vehtari et al. 2021, Bayesian Analysis 16, 667, eq. 10),
 * truncated by Geyer's (1992, Statistical Science 7, 473) initial monotone sequence.
 * No rank normalisation: the quantities tested here have finite variance.
 */

/** Column `j` of a draws × dim row-major matrix. */
export function column(draws: Float64Array, dim: number, j: number): Float64Array {
  const n = draws.length / dim;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) out[i] = draws[i * dim + j];
  return out;
}

/** Applies `f` elementwise (e.g. to get squared deviations). */
export function mapSeries(x: Float64Array, f: (v: number) => number): Float64Array {
  const out = new Float64Array(x.length);
  for (let i = 0; i < x.length; i++) out[i] = f(x[i]);
  return out;
}

function mean(x: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i];
  return s / x.length;
}

/** Effective sample size of the mean of a quantity over several equal-length chains. */
export function effectiveSampleSize(chains: readonly Float64Array[]): number {
  const m = chains.length;
  const n = chains[0].length;
  const means = chains.map(mean);
  const variances = chains.map((x, c) => {
    let s = 0;
    for (let i = 0; i < n; i++) s += (x[i] - means[c]) ** 2;
    return s / (n - 1);
  });
  const w = mean(variances);
  const grand = mean(means);
  let b = 0;
  if (m > 1) {
    for (const mu of means) b += (mu - grand) ** 2;
    b /= m - 1;
  }
  const varPlus = ((n - 1) / n) * w + b;
  if (!(varPlus > 0)) return m * n;
  const autocov = (t: number): number => {
    let total = 0;
    for (let c = 0; c < m; c++) {
      const x = chains[c];
      const mu = means[c];
      let s = 0;
      for (let i = 0; i + t < n; i++) s += (x[i] - mu) * (x[i + t] - mu);
      total += s / n;
    }
    return total / m;
  };
  const rho = (t: number): number => 1 - (w - autocov(t)) / varPlus;
  let tau = -1;
  let previous = Infinity;
  for (let k = 0; 2 * k + 1 < n; k++) {
    let p = rho(2 * k) + rho(2 * k + 1);
    if (!(p > 0)) break;
    if (p > previous) p = previous;
    previous = p;
    tau += 2 * p;
  }
  // Vehtari et al. (2021) cap the estimate at N log10(N) for antithetic chains.
  const cap = m * n * Math.log10(m * n);
  return tau > 0 ? Math.min((m * n) / tau, cap) : cap;
}

/** Pooled mean, its Monte Carlo standard error and the ESS behind it. */
export function meanWithMcse(chains: readonly Float64Array[]): { mean: number; mcse: number; ess: number } {
  const all = chains.flatMap((x) => Array.from(x));
  const mu = mean(all);
  let s = 0;
  for (const v of all) s += (v - mu) ** 2;
  const sd = Math.sqrt(s / (all.length - 1));
  const ess = effectiveSampleSize(chains);
  return { mean: mu, mcse: sd / Math.sqrt(ess), ess };
}

/**
 * Pooled variance estimate around a known mean `centre` (mean of (x − centre)²), with
 * its MCSE from the ESS of the squared deviations (common practice).
 */
export function varianceWithMcse(
  chains: readonly Float64Array[],
  centre: number,
): { variance: number; mcse: number; ess: number } {
  const sq = chains.map((x) => mapSeries(x, (v) => (v - centre) ** 2));
  const r = meanWithMcse(sq);
  return { variance: r.mean, mcse: r.mcse, ess: r.ess };
}

/** Chi-square upper-tail p-value for `k` degrees of freedom (Wilson–Hilferty 1931 approximation). */
export function chiSquareUpperTail(statistic: number, k: number): number {
  const z = (Math.cbrt(statistic / k) - (1 - 2 / (9 * k))) / Math.sqrt(2 / (9 * k));
  return 0.5 * erfc(z / Math.SQRT2);
}

/** Complementary error function (Numerical Recipes, 3rd ed., sec. 6.2.2, erfc Chebyshev fit, |error| < 1.2e-7). */
export function erfc(x: number): number {
  const z = Math.abs(x);
  const t = 1 / (1 + 0.5 * z);
  const r =
    t *
    Math.exp(
      -z * z -
        1.26551223 +
        t *
          (1.00002368 +
            t *
              (0.37409196 +
                t *
                  (0.09678418 +
                    t * (-0.18628806 + t * (0.27886807 + t * (-1.13520398 + t * (1.48851587 + t * (-0.82215223 + t * 0.17087277)))))))),
    );
  return x >= 0 ? r : 2 - r;
}

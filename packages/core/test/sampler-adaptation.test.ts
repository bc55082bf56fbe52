import { describe, expect, it } from 'vitest';
import { createRandomStream } from '../src/random/index.js';
import {
  addToWelford,
  copyPhasePoint,
  createPhasePoint,
  heuristicStepSize,
  identityMetric,
  leapfrogStep,
  advanceChain,
  averagedStepSize,
  createChainState,
  createWelford,
  regularisedCovariance,
  correlationShrinkage,
  defaultDualAveragingConstants,
  resetWelford,
  resolveChainSettings,
  startDualAveraging,
  recentreDualAveraging,
  runChains,
  updateDualAveraging,
  warmupSchedule,
  type WarmupSchedule,
} from '../src/sampler/index.js';
import { gaussianWithPrecision, standardNormal } from './support/targets.js';

function checkInvariants(s: WarmupSchedule): void {
  const w = s.slowWindows;
  if (w.length === 0) return;
  expect(w[0][0]).toBe(s.initialFast);
  expect(w[w.length - 1][1]).toBe(s.warmup - s.terminalFast);
  for (let k = 1; k < w.length; k++) {
    expect(w[k][0]).toBe(w[k - 1][1]);
    // Each window at least doubles the previous one.
    expect(w[k][1] - w[k][0]).toBeGreaterThanOrEqual(2 * (w[k - 1][1] - w[k - 1][0]));
  }
}

describe('warmup schedule', () => {
  it('uses 75 / 25 doubling / 50 for warmup 1000', () => {
    // The 75-iteration initial interval, first slow window of 25 and terminal 50 are
    // the customary defaults of windowed adaptation for 1000 warmup iterations (common practice).
    const s = warmupSchedule(1000, true);
    expect(s.initialFast).toBe(75);
    expect(s.terminalFast).toBe(50);
    expect(s.slowWindows).toEqual([
      [75, 100],
      [100, 150],
      [150, 250],
      [250, 450],
      [450, 950],
    ]);
    checkInvariants(s);
  });

  it('keeps the interval sizes and adds doubling windows for longer warmups', () => {
    const s = warmupSchedule(2000, true);
    expect(s.initialFast).toBe(75);
    expect(s.terminalFast).toBe(50);
    expect(s.slowWindows).toEqual([
      [75, 100],
      [100, 150],
      [150, 250],
      [250, 450],
      [450, 850],
      [850, 1950],
    ]);
    checkInvariants(s);
  });

  it('scales the sizes in proportion for short warmups', () => {
    const s = warmupSchedule(100, true);
    expect(s.initialFast).toBe(8); // round(7.5)
    expect(s.terminalFast).toBe(5);
    expect(s.slowWindows).toEqual([
      [8, 11],
      [11, 17],
      [17, 29],
      [29, 95],
    ]);
    for (const w of [20, 37, 150, 333, 999, 1001, 5000]) checkInvariants(warmupSchedule(w, true));
  });

  it('adapts only the step size below 20 iterations or for the unit metric', () => {
    expect(warmupSchedule(19, true)).toEqual({ warmup: 19, initialFast: 19, slowWindows: [], terminalFast: 0 });
    expect(warmupSchedule(1000, false).slowWindows).toEqual([]);
    expect(warmupSchedule(20, true).slowWindows.length).toBeGreaterThan(0);
    expect(warmupSchedule(0, true).slowWindows).toEqual([]);
  });

  it('re-estimates the metric exactly at the end of each slow window', () => {
    const precision = Float64Array.from([100, 0, 0, 0.01]);
    const target = gaussianWithPrecision(precision, 2);
    const settings = resolveChainSettings({ warmup: 1000, draws: 0 });
    const state = createChainState(target, settings, 0, 5);
    const changes: number[] = [];
    let metric = state.metric;
    for (let t = 0; t < 1000; t++) {
      advanceChain(target, settings, state);
      if (state.metric !== metric) {
        changes.push(t);
        metric = state.metric;
      }
    }
    expect(changes).toEqual([99, 149, 249, 449, 949]);
    // The final metric estimates the variances 0.01 and 100 from the 500-draw window:
    // within 4 se of a variance estimate, σ² sqrt(2 / ESS), taking ESS ≥ 100 (common practice).
    if (state.metric.kind !== 'diagonal') throw new Error('expected a diagonal metric');
    const tol = 4 * Math.sqrt(2 / 100);
    expect(Math.abs(state.metric.inverseMass[0] / 0.01 - 1)).toBeLessThan(tol);
    expect(Math.abs(state.metric.inverseMass[1] / 100 - 1)).toBeLessThan(tol);
  });
});

describe('dual averaging', () => {
  it('drives the acceptance statistic to its target on a known acceptance curve', () => {
    // With a deterministic acceptance a(ε) = exp(−ε), the averaged iterate of
    // Hoffman & Gelman (2014, eq. 6) converges to the root of a(ε) = δ, ε* = −ln δ.
    const delta = 0.8;
    const state = startDualAveraging(1);
    let eps = 1;
    for (let m = 0; m < 5000; m++) eps = updateDualAveraging(state, Math.exp(-eps), delta);
    expect(Math.abs(averagedStepSize(state) / -Math.log(delta) - 1)).toBeLessThan(0.02);
    expect(state.mu).toBeCloseTo(Math.log(10), 14);
  });

  it('re-centres on a new step size and keeps the gain it has reached', () => {
    // Hoffman & Gelman (2014, eq. 6): x_m = μ − √m/γ · H̄_m with H̄_m = (1 − w) H̄_{m−1}
    // + w (δ − α_m), w = 1/(m + t₀). After re-centring at ε, the first update is the
    // same formula with m counting the 200 earlier updates: μ = log ε and H̄ = 0, so
    // x = log ε − √201/γ · (δ − α)/(201 + t₀).
    const { gamma, t0 } = defaultDualAveragingConstants;
    const state = startDualAveraging(1);
    for (let m = 0; m < 200; m++) updateDualAveraging(state, m % 2 === 0 ? 0.6 : 0.95, 0.8);
    const moved = recentreDualAveraging(state, 0.3);
    expect(moved).toMatchObject({ mu: Math.log(0.3), logStepSize: Math.log(0.3), acceptanceGap: 0, count: 0, priorUpdates: 200 });
    const eps = updateDualAveraging(moved, 0.2, 0.8);
    expect(Math.log(eps)).toBeCloseTo(Math.log(0.3) - (Math.sqrt(201) / gamma) * (0.6 / (201 + t0)), 12);
    // The average restarts: after one update it is that update's iterate.
    expect(averagedStepSize(moved)).toBeCloseTo(eps, 12);
    // A full restart starts at m = 1 from μ = log 10ε instead; its gain then grows to
    // √m/γ/(m + t₀) ≈ 3.2 at m = 10, against 1.34 here.
    const fresh = startDualAveraging(0.3);
    const freshEps = updateDualAveraging(fresh, 0.2, 0.8);
    expect(Math.log(0.3 * 10) - Math.log(freshEps)).toBeCloseTo((1 / gamma) * (0.6 / (1 + t0)), 12);
    // Re-centring twice accumulates the counts.
    expect(recentreDualAveraging(moved, 0.3).priorUpdates).toBe(201);
  });

  it('samples at the target acceptance after warmup (25-D Gaussian, variances over four decades)', async () => {
    // Dual averaging aims the mean acceptance statistic at δ (Hoffman & Gelman 2014,
    // sec. 3.2). A tolerance of 0.05 is a design choice (common practice: realised
    // acceptance near the target); the mean's Monte Carlo standard error is about 0.003
    // here. Restarting dual averaging in full after every metric update, as this sampler
    // did before, gave 0.86–0.88 for δ = 0.8 on this target (seeds 1–4, both metrics).
    const dim = 25;
    const sd = Float64Array.from({ length: dim }, (_, i) => 10 ** ((2 * i) / (dim - 1) - 1));
    const target = {
      dim,
      logDensityGrad(x: Float64Array, g: Float64Array): number {
        let s = 0;
        for (let i = 0; i < dim; i++) {
          const z = x[i] / sd[i];
          s -= 0.5 * z * z;
          g[i] = -z / sd[i];
        }
        return s;
      },
    };
    for (const [metric, delta] of [['diagonal', 0.8], ['dense', 0.8], ['diagonal', 0.65], ['dense', 0.9]] as const) {
      const run = await runChains(target, { chains: 4, warmup: 1000, draws: 1000, seed: 1, metric, targetAcceptance: delta });
      let sum = 0;
      for (const s of run.stats) for (const a of s.acceptance) sum += a;
      expect(Math.abs(sum / 4000 - delta), `${metric}, δ = ${delta}`).toBeLessThan(0.05);
    }
  });

  it('treats a non-finite acceptance statistic as zero (shrinks the step)', () => {
    const a = startDualAveraging(1);
    const b = startDualAveraging(1);
    updateDualAveraging(a, Number.NaN, 0.8);
    updateDualAveraging(b, 0, 0.8);
    expect(a).toEqual(b);
  });
});

describe('Welford accumulators', () => {
  it('match a two-pass covariance, with the documented shrinkage', () => {
    // Two-pass sample covariance as the independent computation (common practice).
    const rng = createRandomStream('welford');
    const dim = 3;
    const n = 50; // ≥ 2·dim, so the dense estimate keeps its off-diagonal terms
    const xs = Array.from({ length: n }, () => Float64Array.from([rng.normal() * 3 + 1, rng.normal(), rng.normal() + 5]));
    for (let i = 0; i < n; i++) xs[i][1] += 0.5 * xs[i][0];
    const dense = createWelford('dense', dim);
    const diag = createWelford('diagonal', dim);
    for (const x of xs) {
      addToWelford(dense, x);
      addToWelford(diag, x);
    }
    const mean = [0, 1, 2].map((j) => xs.reduce((s, x) => s + x[j], 0) / n);
    const cov = (i: number, j: number): number => xs.reduce((s, x) => s + (x[i] - mean[i]) * (x[j] - mean[j]), 0) / (n - 1);
    const w = n / (n + 5);
    const ridge = 1e-3 * (5 / (n + 5));
    // Schäfer & Strimmer (2005) target D: λ = Σ Var(r_ij) / Σ r_ij² over i ≠ j, with
    // Var(r) = (1 − r²)² / (n − 1) (from memory), here from the two-pass correlations.
    let noise = 0;
    let signal = 0;
    for (let i = 0; i < dim; i++) {
      for (let j = 0; j < dim; j++) {
        if (i === j) continue;
        const r = cov(i, j) / Math.sqrt(cov(i, i) * cov(j, j));
        noise += (1 - r * r) ** 2 / (n - 1);
        signal += r * r;
      }
    }
    const lambda = noise / signal;
    expect(lambda).toBeGreaterThan(0);
    expect(lambda).toBeLessThan(1);
    expect(correlationShrinkage(dense)).toBeCloseTo(lambda, 12);
    const d = regularisedCovariance(dense, true)!;
    const plain = regularisedCovariance(dense)!;
    const v = regularisedCovariance(diag)!;
    for (let i = 0; i < dim; i++) {
      expect(v[i]).toBeCloseTo(w * cov(i, i) + ridge, 12);
      for (let j = 0; j < dim; j++) {
        expect(d[i * dim + j]).toBeCloseTo(i === j ? w * cov(i, i) + ridge : (1 - lambda) * w * cov(i, j), 12);
        expect(plain[i * dim + j]).toBeCloseTo(w * cov(i, j) + (i === j ? ridge : 0), 12);
      }
    }
    resetWelford(dense);
    expect(dense.count).toBe(0);
    expect(regularisedCovariance(dense)).toBeNull();
  });

  it('drops off-diagonal terms when a dense window has fewer than 2·dim draws', () => {
    const rng = createRandomStream('short window');
    const w = createWelford('dense', 10);
    for (let i = 0; i < 19; i++) addToWelford(w, Float64Array.from({ length: 10 }, () => rng.normal()));
    const c = regularisedCovariance(w)!;
    expect(c[1]).toBe(0);
    expect(c[0]).toBeGreaterThan(0);
  });

  it('shrinks noise correlations nearly away and keeps strong ones measured with many draws', () => {
    const rng = createRandomStream('shrinkage extremes');
    const fill = (dim: number, n: number, rho: number) => {
      const w = createWelford('dense', dim);
      for (let k = 0; k < n; k++) {
        // Equicorrelated normal draws: x_i = √ρ z0 + √(1 − ρ) z_i, correlation ρ between all pairs.
        const z0 = rng.normal();
        addToWelford(w, Float64Array.from({ length: dim }, () => Math.sqrt(rho) * z0 + Math.sqrt(1 - rho) * rng.normal()));
      }
      return w;
    };
    // Independent coordinates, 2·dim draws: every sample correlation is noise.
    expect(correlationShrinkage(fill(20, 40, 0))).toBeGreaterThan(0.8);
    // ρ = 0.9 from 4000 draws: λ ≈ (1 − 0.81)² / (4000 · 0.81) ≈ 1e-5.
    const strong = fill(5, 4000, 0.9);
    expect(correlationShrinkage(strong)).toBeLessThan(1e-4);
    const c = regularisedCovariance(strong, true)!;
    expect(c[1] / Math.sqrt(c[0] * c[6])).toBeCloseTo(0.9, 1);
  });

  it('estimates a correlated covariance better than the unshrunk window (Schäfer & Strimmer 2005)', () => {
    // Their simulations: the shrinkage estimate has lower mean squared error than the
    // sample covariance when n is comparable to the dimension. Here d = 23 (the demo's
    // model) and n = 50 (the second slow window of a dense warmup), AR(1) correlation
    // 0.5^|i−j|; error in the Frobenius norm of the correlation matrix, 40 windows.
    const rng = createRandomStream('shrinkage mse');
    const dim = 23;
    const n = 50;
    let shrunkError = 0;
    let plainError = 0;
    for (let rep = 0; rep < 40; rep++) {
      const w = createWelford('dense', dim);
      for (let k = 0; k < n; k++) {
        const x = new Float64Array(dim);
        x[0] = rng.normal();
        for (let i = 1; i < dim; i++) x[i] = 0.5 * x[i - 1] + Math.sqrt(0.75) * rng.normal();
        addToWelford(w, x);
      }
      const c = regularisedCovariance(w, true)!;
      for (let i = 1; i < dim; i++) {
        for (let j = 0; j < i; j++) {
          const truth = 0.5 ** (i - j);
          const plain = w.m2[i * dim + j] / Math.sqrt(w.m2[i * dim + i] * w.m2[j * dim + j]);
          const shrunk = c[i * dim + j] / Math.sqrt((c[i * dim + i] - 1e-3 * (5 / (n + 5))) * (c[j * dim + j] - 1e-3 * (5 / (n + 5))));
          plainError += (plain - truth) ** 2;
          shrunkError += (shrunk - truth) ** 2;
        }
      }
    }
    expect(shrunkError).toBeLessThan(0.9 * plainError);
  });
});

describe('heuristic initial step size', () => {
  it('returns a step where the one-step acceptance ratio crosses 1/2 (Hoffman & Gelman 2014, alg. 4)', () => {
    // Algorithm 4 doubles (halves) ε while the acceptance ratio of one leapfrog step
    // with a fixed momentum stays above (below) 1/2; the ratio at the returned ε is on
    // the other side of 1/2 from the ratio at the previous ε.
    const target = standardNormal(5);
    const metric = identityMetric('unit', 5);
    const rng = createRandomStream('heuristic');
    for (const [startEps, q] of [
      [1e-4, [0.1, -0.2, 0.3, 0.5, -1]],
      [50, [2, -1, 0.3, 0.5, -1]],
    ] as const) {
      const start = createPhasePoint(5);
      const trial = createPhasePoint(5);
      start.position.set(q);
      start.logDensity = target.logDensityGrad(start.position, start.gradient);
      const eps = heuristicStepSize(target, metric, rng, startEps, start, trial);
      const logRatio = (e: number): number => {
        copyPhasePoint(start, trial);
        leapfrogStep(target, metric, e, trial);
        return start.kinetic - start.logDensity - (trial.kinetic - trial.logDensity);
      };
      const up = startEps < 1;
      const previous = up ? eps / 2 : eps * 2;
      if (up) {
        expect(logRatio(previous)).toBeGreaterThan(-Math.LN2);
        expect(logRatio(eps)).toBeLessThanOrEqual(-Math.LN2);
      } else {
        expect(logRatio(previous)).toBeLessThan(-Math.LN2);
        expect(logRatio(eps)).toBeGreaterThanOrEqual(-Math.LN2);
      }
    }
  });
});

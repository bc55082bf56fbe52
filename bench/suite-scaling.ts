/**
 * How NUTS's cost grows with dimension: leapfrog steps per draw on a mildly correlated
 * Gaussian (stationary AR(1), lag-one correlation 0.5, unit variances, condition number
 * 9) for d = 10 … 1000, diagonal metric, adapted step size. Theory for HMC with an
 * optimally tuned step size: steps per independent draw grow like d^(1/4) (Beskos et
 * al. 2013, Bernoulli 19, 1501); the suite fits the exponent of steps per draw against d
 * by least squares on the logs, and shows ESS per gradient and CPU time per step
 * (which includes the O(d) gradient and the O(d) sampler work).
 *
 * Run: npx tsx --conditions=source bench/suite-scaling.ts [--quick]
 */
import { runChains } from '@apsis/core';
import { cpuSeconds } from './support/cpuTime.js';
import { runIfMain, type Figure, type SuiteOptions, type SuiteResult } from './support/figures.js';
import { autoregressiveGaussian } from './support/gaussianTargets.js';
import { minBulkEss } from './support/minEss.js';

interface Row {
  readonly dim: number;
  readonly stepsPerDraw: number;
  readonly essPerGradient: number;
  readonly secondsPerStep: number;
  readonly stepSize: number;
}

/** Least-squares slope of log y against log x. */
export function logSlope(x: readonly number[], y: readonly number[]): number {
  const lx = x.map(Math.log);
  const ly = y.map(Math.log);
  const mx = lx.reduce((a, b) => a + b, 0) / lx.length;
  const my = ly.reduce((a, b) => a + b, 0) / ly.length;
  let sxy = 0;
  let sxx = 0;
  for (let i = 0; i < lx.length; i++) {
    sxy += (lx[i] - mx) * (ly[i] - my);
    sxx += (lx[i] - mx) ** 2;
  }
  return sxy / sxx;
}

/** Runs the scaling suite. */
export async function run(options: SuiteOptions): Promise<SuiteResult> {
  const start = performance.now();
  const dims = options.quick ? [10, 100, 1000] : [10, 30, 100, 300, 1000];
  const rows: Row[] = [];
  for (const dim of dims) {
    const g = autoregressiveGaussian(dim, 0.5);
    const t0 = cpuSeconds();
    const r = await runChains(g.target, { chains: 2, warmup: options.quick ? 300 : 500, draws: options.quick ? 300 : 500, seed: 7 + dim, keepWarmup: true });
    const seconds = cpuSeconds() - t0;
    const steps = r.stats.reduce((s, c) => s + c.leapfrogSteps.reduce((a, b) => a + b, 0), 0);
    const draws = r.stats.reduce((s, c) => s + c.leapfrogSteps.length, 0);
    const warmupSteps = r.warmup!.stats.reduce((s, c) => s + c.leapfrogSteps.reduce((a, b) => a + b, 0), 0);
    const ess = minBulkEss(r.draws, dim).ess;
    rows.push({
      dim,
      stepsPerDraw: steps / draws,
      essPerGradient: ess / steps,
      secondsPerStep: seconds / (steps + warmupSteps),
      stepSize: r.adaptation.reduce((s, a) => s + a.stepSize, 0) / r.adaptation.length,
    });
  }
  const exponent = logSlope(rows.map((r) => r.dim), rows.map((r) => r.stepsPerDraw));
  const essExponent = logSlope(rows.map((r) => r.dim), rows.map((r) => r.essPerGradient));
  const figures: Figure[] = [
    {
      group: 'scaling with dimension (AR(1) Gaussian, ρ = 0.5)',
      name: 'exponent a of leapfrog steps per draw ∝ d^a',
      value: exponent,
      unit: '',
      note: `theory for tuned HMC: 1/4; d = ${dims.join(', ')}: ${rows.map((r) => r.stepsPerDraw.toFixed(1)).join(', ')} steps per draw`,
    },
    {
      group: 'scaling with dimension (AR(1) Gaussian, ρ = 0.5)',
      name: 'exponent of min ESS per gradient ∝ d^b',
      value: essExponent,
      unit: '',
      note: `d = ${dims.join(', ')}: ${rows.map((r) => r.essPerGradient.toExponential(1)).join(', ')}`,
    },
  ];
  const details = [
    'steps per draw against dimension (2 chains, sampling phase):',
    '  d       steps/draw   step size   min ESS/gradient   CPU µs per step (whole run)',
    ...rows.map(
      (r) =>
        `  ${String(r.dim).padEnd(7)} ${r.stepsPerDraw.toFixed(1).padEnd(12)} ${r.stepSize.toFixed(3).padEnd(11)} ${r.essPerGradient.toExponential(2).padEnd(18)} ${(r.secondsPerStep * 1e6).toFixed(2)}`,
    ),
  ];
  return { suite: 'scaling', figures, details, seconds: (performance.now() - start) / 1000 };
}

await runIfMain(import.meta.url, run);

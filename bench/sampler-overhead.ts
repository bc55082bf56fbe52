/**
 * Sampler benchmarks, printed as ratios measured in one run.
 *
 * 1. Overhead per leapfrog step: NUTS (diagonal metric, adapted) on a cheap 100-D
 *    Gaussian with a diagonal precision, time per leapfrog step against the time of one
 *    gradient evaluation of the same target. The ratio (step − gradient) / gradient is
 *    what the sampler itself costs per step, in units of the cheapest gradient.
 * 2. ESS per gradient on a 50-D Gaussian with condition number 1e4 and a random
 *    rotation: the smallest bulk-ESS over coordinates per gradient evaluation after
 *    warmup, for the dense and the diagonal metric.
 *
 * Times are CPU seconds of this process (process.cpuUsage), so that other work on a shared
 * machine inflates them less than wall time would.
 *
 * Run: npx tsx --conditions=source bench/sampler-overhead.ts [--quick]
 */
import { pathToFileURL } from 'node:url';
import {
  advanceChain,
  createChainState,
  resolveChainSettings,
  runChains,
  type RunResult,
  type Target,
} from '@apsis/core';
import { bulkEss } from '@apsis/diagnostics';
import { illConditionedGaussian } from '../packages/core/test/support/targets.js';

export interface SamplerOverheadFigures {
  readonly dim: number;
  /** Seconds per gradient call of the target alone. */
  readonly gradientSeconds: number;
  /** Seconds per leapfrog step inside NUTS (sampling phase). */
  readonly stepSeconds: number;
  /** (step − gradient) / gradient. */
  readonly overheadRatio: number;
  readonly leapfrogSteps: number;
}

export interface MetricEssFigures {
  readonly dim: number;
  readonly denseEssPerGradient: number;
  readonly diagonalEssPerGradient: number;
  readonly ratio: number;
  readonly denseSeconds: number;
  readonly diagonalSeconds: number;
}

/** A 100-D Gaussian with variances 1 … 100 (diagonal precision): about 3 flops per coordinate. */
function cheapGaussian(dim: number): Target {
  const precision = Float64Array.from({ length: dim }, (_, i) => 1 / (1 + i));
  return {
    dim,
    logDensityGrad(x, g) {
      let s = 0;
      for (let i = 0; i < dim; i++) {
        const gi = -precision[i] * x[i];
        g[i] = gi;
        s += x[i] * gi;
      }
      return 0.5 * s;
    },
  };
}

/** CPU seconds of this process (user + system): unlike wall time, not inflated by other processes. */
function cpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/**
 * Times one NUTS chain's sampling phase against bare gradient calls, in CPU time.
 * The two are measured in alternating rounds and the fastest round of each is kept.
 */
export function measureSamplerOverhead(dim = 100, iterations = 4000, rounds = 8): SamplerOverheadFigures {
  const target = cheapGaussian(dim);
  const perRound = Math.ceil(iterations / rounds);
  const settings = resolveChainSettings({ warmup: 500, draws: perRound * rounds });
  const state = createChainState(target, settings, 0, 77);
  for (let t = 0; t < settings.warmup; t++) advanceChain(target, settings, state);
  const x = Float64Array.from({ length: dim }, (_, i) => Math.sin(i));
  const g = new Float64Array(dim);
  let sink = 0;
  let bestStep = Infinity;
  let bestGradient = Infinity;
  let total = 0;
  for (let r = 0; r < rounds; r++) {
    let steps = 0;
    const t0 = cpuSeconds();
    for (let t = 0; t < perRound; t++) steps += advanceChain(target, settings, state).stats.leapfrogSteps;
    bestStep = Math.min(bestStep, (cpuSeconds() - t0) / steps);
    total += steps;
    // Bare gradients at moving positions, 4 times as many as the round's leapfrog steps.
    const calls = 4 * steps;
    const t1 = cpuSeconds();
    for (let k = 0; k < calls; k++) {
      x[k % dim] += 1e-9;
      sink += target.logDensityGrad(x, g);
    }
    bestGradient = Math.min(bestGradient, (cpuSeconds() - t1) / calls);
  }
  if (!Number.isFinite(sink)) throw new Error('unexpected non-finite density');
  return {
    dim,
    gradientSeconds: bestGradient,
    stepSeconds: bestStep,
    overheadRatio: (bestStep - bestGradient) / bestGradient,
    leapfrogSteps: total,
  };
}

function minEssPerGradient(r: RunResult, dim: number): number {
  let grads = 0;
  for (const s of r.stats) for (const l of s.leapfrogSteps) grads += l;
  let ess = Infinity;
  for (let j = 0; j < dim; j++) {
    const chains = r.draws.map((d) => {
      const n = d.length / dim;
      const out = new Float64Array(n);
      for (let i = 0; i < n; i++) out[i] = d[i * dim + j];
      return out;
    });
    ess = Math.min(ess, bulkEss(chains));
  }
  return ess / grads;
}

/** ESS per gradient of the dense and diagonal metrics on the ill-conditioned Gaussian. */
export async function measureMetricEss(dim = 50, chains = 4): Promise<MetricEssFigures> {
  const g = illConditionedGaussian(dim);
  const dense = await runChains(g.target, { seed: 31, metric: 'dense', chains });
  const diagonal = await runChains(g.target, { seed: 32, metric: 'diagonal', chains });
  const d = minEssPerGradient(dense, dim);
  const a = minEssPerGradient(diagonal, dim);
  return {
    dim,
    denseEssPerGradient: d,
    diagonalEssPerGradient: a,
    ratio: d / a,
    denseSeconds: dense.elapsed,
    diagonalSeconds: diagonal.elapsed,
  };
}

async function main(): Promise<void> {
  const quick = process.argv.includes('--quick');
  const o = measureSamplerOverhead(100, quick ? 1000 : 4000);
  console.log(`NUTS overhead, ${o.dim}-D Gaussian with diagonal precision (${o.leapfrogSteps} leapfrog steps):`);
  console.log(`  gradient alone      ${(o.gradientSeconds * 1e9).toFixed(0)} ns`);
  console.log(`  leapfrog step       ${(o.stepSeconds * 1e9).toFixed(0)} ns`);
  console.log(`  overhead / gradient ${o.overheadRatio.toFixed(2)}`);
  const e = await measureMetricEss(50, quick ? 2 : 4);
  console.log(`ESS per gradient, ${e.dim}-D Gaussian, condition number 1e4, rotated (min bulk-ESS over coordinates):`);
  console.log(`  dense metric        ${e.denseEssPerGradient.toExponential(2)}  (${e.denseSeconds.toFixed(1)} s)`);
  console.log(`  diagonal metric     ${e.diagonalEssPerGradient.toExponential(2)}  (${e.diagonalSeconds.toFixed(1)} s)`);
  console.log(`  dense / diagonal    ${e.ratio.toFixed(1)}`);
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}

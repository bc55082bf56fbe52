/**
 * Where the warmup's gradients go on the demo's joint model: leapfrog steps per
 * iteration in each interval of a 1000-iteration warmup (the initial fast interval, each
 * slow window, the terminal interval), against the sampling phase's, for 4 chains with
 * the demo's dense metric; and the smallest bulk ESS of the physical parameters per
 * gradient of the whole run, warmup included (the figure of suite-baseline.ts). One seed
 * per call, so that two calls can share the two cores:
 *
 *   npx tsx --conditions=source bench/warmup-windows.ts [seed]
 */
import { runChains, warmupSchedule } from '@apsis/core';
import { buildDemoModel } from '../examples/demo/demoModel.js';
import { minParameterEss } from './support/parameterEss.js';

const seed = Number(process.argv[2] ?? 11);
const chains = 4;
const warmup = 1000;
const model = await buildDemoModel();
const t0 = performance.now();
const run = await runChains(model, { warmup, draws: 1000, chains, seed, metric: 'dense', keepWarmup: true });
const seconds = (performance.now() - t0) / 1000;

const schedule = warmupSchedule(warmup, true);
const edges = [0, ...schedule.slowWindows.map((w) => w[0]), warmup - schedule.terminalFast, warmup];
const warmupStats = run.warmup!.stats;
const perInterval = edges.slice(1).map((end, k) => {
  let steps = 0;
  for (const s of warmupStats) for (let i = edges[k]; i < end; i++) steps += s.leapfrogSteps[i];
  return `[${edges[k]},${end}) ${(steps / (chains * (end - edges[k]))).toFixed(0)}`;
});
const total = (cols: readonly Int32Array[]): number => cols.reduce((s, c) => s + c.reduce((a, b) => a + b, 0), 0);
const warmupGradients = total(warmupStats.map((s) => s.leapfrogSteps));
const samplingGradients = total(run.stats.map((s) => s.leapfrogSteps));
const ess = minParameterEss(model, run.draws);
console.log(`seed ${seed}: steps per iteration ${perInterval.join(', ')}; sampling ${(samplingGradients / (chains * 1000)).toFixed(1)}`);
console.log(
  `  gradients: warmup ${warmupGradients}, sampling ${samplingGradients}; min bulk ESS ${ess.toFixed(0)}, ` +
    `${(ess / (warmupGradients + samplingGradients)).toExponential(2)} per gradient of the whole run; ` +
    `step sizes ${run.adaptation.map((a) => a.stepSize.toFixed(3)).join(', ')}; ${seconds.toFixed(1)} s`,
);

/**
 * Sampler overhead per leapfrog step, at d = 100, in units of a gradient.
 *
 * 1. The honest case: NUTS with an adapted diagonal metric on the 100-D Gaussian with
 *    condition number 1e4 and a random rotation (dense precision), whose gradient is one
 *    100 × 100 matrix-vector product. Time per leapfrog step inside NUTS (sampling phase)
 *    against the time of the bare gradient: (step − gradient) / gradient. With the
 *    diagonal metric this target's trees are deep (the metric cannot undo the rotation),
 *    so the per-iteration momentum draw is spread over many steps.
 * 2. Shallow trees: the same measurement on an iid 100-D Gaussian (cheap gradient, trees
 *    of depth 3–4, so the momentum draw is paid every ~10 steps). The absolute overhead in
 *    ns is then also expressed as a fraction of the dense gradient of case 1: what a
 *    100-D model with that gradient cost would pay at shallow trees.
 * 3. The dense metric on the rotated Gaussian: each step adds one product with M⁻¹
 *    (100 × 100), the same size as the gradient itself, so this "overhead" is ~100% by
 *    construction; shown for scale, without a target.
 *
 * Times are wall-clock seconds in many short alternating blocks (a few milliseconds of
 * chain, then as many bare gradients as the block had steps); the ratio is formed within
 * each block and the median over blocks reported, so that load from other processes,
 * which comes and goes on a shared machine, cancels.
 *
 * Run: npx tsx --conditions=source bench/suite-overhead.ts [--quick]
 */
import { advanceChain, createChainState, resolveChainSettings, type Target } from '@apsis/core';
import { wallSeconds } from './support/cpuTime.js';
import { runIfMain, type Figure, type SuiteOptions, type SuiteResult } from './support/figures.js';
import { autoregressiveGaussian, rotatedGaussian } from './support/gaussianTargets.js';
import { median } from './support/median.js';

export interface OverheadFigures {
  /** Median seconds per bare gradient call. */
  readonly gradient: number;
  /** Median seconds per leapfrog step inside NUTS. */
  readonly step: number;
  /** Median over blocks of (step − gradient) / gradient, and its quartiles. */
  readonly ratio: number;
  readonly quartiles: [number, number];
  readonly stepsPerDraw: number;
  readonly steps: number;
}

/**
 * Time per leapfrog step of an adapted NUTS chain and per bare gradient call, in many
 * short alternating blocks (wall clock): in each block the chain runs transitions for
 * about `blockSeconds`, then the bare gradient is called as many times as the block
 * had leapfrog steps. The overhead ratio is taken within each block (so load that comes
 * and goes hits both halves alike) and its median over the blocks is reported.
 */
export function measureOverhead(
  target: Target,
  metric: 'diagonal' | 'dense',
  options: { warmup: number; blockSeconds: number; blocks: number; seed: number },
): OverheadFigures {
  const dim = target.dim;
  const settings = resolveChainSettings({ warmup: options.warmup, draws: 1e9, metric });
  const state = createChainState(target, settings, 0, options.seed);
  for (let t = 0; t < settings.warmup; t++) advanceChain(target, settings, state);
  const x = Float64Array.from({ length: dim }, (_, i) => 0.1 * Math.sin(i));
  const g = new Float64Array(dim);
  let sink = 0;
  const ratios: number[] = [];
  const stepTimes: number[] = [];
  const gradientTimes: number[] = [];
  let totalSteps = 0;
  let totalDraws = 0;
  // The first blocks warm up the compiled code and are not counted.
  const warm = Math.ceil(options.blocks / 10);
  for (let b = 0; b < options.blocks + warm; b++) {
    let steps = 0;
    let draws = 0;
    const t0 = wallSeconds();
    while (wallSeconds() - t0 < options.blockSeconds) {
      steps += advanceChain(target, settings, state).stats.leapfrogSteps;
      draws++;
    }
    const perStep = (wallSeconds() - t0) / steps;
    const t1 = wallSeconds();
    for (let k = 0; k < steps; k++) {
      x[k % dim] += 1e-9;
      sink += target.logDensityGrad(x, g);
    }
    const perGradient = (wallSeconds() - t1) / steps;
    if (b < warm) continue;
    ratios.push((perStep - perGradient) / perGradient);
    stepTimes.push(perStep);
    gradientTimes.push(perGradient);
    totalSteps += steps;
    totalDraws += draws;
  }
  if (!Number.isFinite(sink)) throw new Error('non-finite density while timing');
  return {
    gradient: median(gradientTimes),
    step: median(stepTimes),
    ratio: median(ratios),
    quartiles: [quantile(ratios, 0.25), quantile(ratios, 0.75)],
    stepsPerDraw: totalSteps / totalDraws,
    steps: totalSteps,
  };
}

function quantile(values: readonly number[], p: number): number {
  const s = [...values].sort((a, b) => a - b);
  const h = (s.length - 1) * p;
  const lo = Math.floor(h);
  return s[lo] + (h - lo) * ((s[Math.min(lo + 1, s.length - 1)] ?? s[lo]) - s[lo]);
}

/** Runs the overhead suite. */
export async function run(options: SuiteOptions): Promise<SuiteResult> {
  const start = performance.now();
  const q = options.quick;
  const dense = rotatedGaussian(100, 1e4, 'apsis bench gaussian');
  const iid = autoregressiveGaussian(100, 0);
  const honest = measureOverhead(dense.target, 'diagonal', { warmup: q ? 150 : 300, blockSeconds: 0.006, blocks: q ? 250 : 300, seed: 41 });
  const shallow = measureOverhead(iid.target, 'diagonal', { warmup: 300, blockSeconds: 0.003, blocks: q ? 150 : 300, seed: 42 });
  const denseMetric = q ? null : measureOverhead(dense.target, 'dense', { warmup: 400, blockSeconds: 0.006, blocks: 100, seed: 43 });
  const ratio = (f: OverheadFigures): number => f.ratio;
  const ns = (s: number): string => `${(s * 1e9).toFixed(0)} ns`;
  const shallowOverhead = shallow.ratio * shallow.gradient;
  const figures: Figure[] = [
    {
      group: 'sampler overhead per leapfrog step, d = 100',
      name: 'NUTS, diagonal metric, dense-covariance Gaussian (cond 1e4)',
      value: 100 * ratio(honest),
      unit: '%',
      digits: 2,
      target: { op: '<', limit: 10 },
      note: `median of ${honest.steps} steps in short blocks: step ${ns(honest.step)} vs gradient ${ns(honest.gradient)}, quartiles of the ratio ${(100 * honest.quartiles[0]).toFixed(1)}–${(100 * honest.quartiles[1]).toFixed(1)}%; ${honest.stepsPerDraw.toFixed(0)} steps per draw`,
    },
    {
      group: 'sampler overhead per leapfrog step, d = 100',
      name: 'absolute overhead at shallow trees (iid Gaussian)',
      value: shallowOverhead * 1e9,
      unit: 'ns',
      note: `step ${ns(shallow.step)} vs gradient ${ns(shallow.gradient)}, ${shallow.stepsPerDraw.toFixed(1)} steps per draw; ${(100 * (shallowOverhead / honest.gradient)).toFixed(1)}% of the dense gradient`,
    },
  ];
  if (denseMetric !== null) {
    figures.push({
      group: 'sampler overhead per leapfrog step, d = 100',
      name: 'NUTS, dense metric, same Gaussian (adds one M⁻¹ product per step)',
      value: 100 * ratio(denseMetric),
      unit: '%',
      digits: 3,
      note: `step ${ns(denseMetric.step)} vs gradient ${ns(denseMetric.gradient)}, ${denseMetric.stepsPerDraw.toFixed(1)} steps per draw`,
    });
  }
  return { suite: 'overhead', figures, details: [], seconds: (performance.now() - start) / 1000 };
}

await runIfMain(import.meta.url, run);

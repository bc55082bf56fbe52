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
 * Times are CPU seconds of this process, chains and bare gradients in alternating rounds,
 * fastest round of each kept.
 *
 * Run: npx tsx --conditions=source bench/suite-overhead.ts [--quick]
 */
import { advanceChain, createChainState, resolveChainSettings, type Target } from '@apsis/core';
import { cpuSeconds } from './support/cpuTime.js';
import { runIfMain, type Figure, type SuiteOptions, type SuiteResult } from './support/figures.js';
import { autoregressiveGaussian, rotatedGaussian } from './support/gaussianTargets.js';

export interface OverheadFigures {
  /** Seconds per bare gradient call. */
  readonly gradient: number;
  /** Seconds per leapfrog step inside NUTS. */
  readonly step: number;
  readonly stepsPerDraw: number;
  readonly steps: number;
}

/**
 * Time per leapfrog step of an adapted NUTS chain and per bare gradient call, in
 * alternating rounds of about `roundSeconds` each; fastest of `rounds`.
 */
export function measureOverhead(
  target: Target,
  metric: 'diagonal' | 'dense',
  options: { warmup: number; roundSeconds: number; rounds: number; seed: number },
): OverheadFigures {
  const dim = target.dim;
  const settings = resolveChainSettings({ warmup: options.warmup, draws: 1e9, metric });
  const state = createChainState(target, settings, 0, options.seed);
  for (let t = 0; t < settings.warmup; t++) advanceChain(target, settings, state);
  const x = Float64Array.from({ length: dim }, (_, i) => 0.1 * Math.sin(i));
  const g = new Float64Array(dim);
  let sink = 0;
  let bestStep = Infinity;
  let bestGradient = Infinity;
  let totalSteps = 0;
  let totalDraws = 0;
  // Warm-up of the timed code paths, then rounds.
  for (let r = -1; r < options.rounds; r++) {
    let steps = 0;
    let draws = 0;
    const t0 = cpuSeconds();
    while (cpuSeconds() - t0 < options.roundSeconds) {
      steps += advanceChain(target, settings, state).stats.leapfrogSteps;
      draws++;
    }
    const perStep = (cpuSeconds() - t0) / steps;
    const calls = Math.max(100, steps);
    const t1 = cpuSeconds();
    for (let k = 0; k < calls; k++) {
      x[k % dim] += 1e-9;
      sink += target.logDensityGrad(x, g);
    }
    const perGradient = (cpuSeconds() - t1) / calls;
    if (r < 0) continue;
    bestStep = Math.min(bestStep, perStep);
    bestGradient = Math.min(bestGradient, perGradient);
    totalSteps += steps;
    totalDraws += draws;
  }
  if (!Number.isFinite(sink)) throw new Error('non-finite density while timing');
  return { gradient: bestGradient, step: bestStep, stepsPerDraw: totalSteps / totalDraws, steps: totalSteps };
}

/** Runs the overhead suite. */
export async function run(options: SuiteOptions): Promise<SuiteResult> {
  const start = performance.now();
  const round = options.quick ? 0.25 : 0.6;
  const rounds = options.quick ? 5 : 9;
  const dense = rotatedGaussian(100, 1e4, 'apsis bench gaussian');
  const iid = autoregressiveGaussian(100, 0);
  const honest = measureOverhead(dense.target, 'diagonal', { warmup: options.quick ? 150 : 300, roundSeconds: round, rounds, seed: 41 });
  const shallow = measureOverhead(iid.target, 'diagonal', { warmup: 300, roundSeconds: round, rounds, seed: 42 });
  const denseMetric = options.quick ? null : measureOverhead(dense.target, 'dense', { warmup: 600, roundSeconds: round, rounds: 5, seed: 43 });
  const ratio = (f: OverheadFigures): number => (f.step - f.gradient) / f.gradient;
  const ns = (s: number): string => `${(s * 1e9).toFixed(0)} ns`;
  const shallowOverhead = shallow.step - shallow.gradient;
  const figures: Figure[] = [
    {
      group: 'sampler overhead per leapfrog step, d = 100',
      name: 'NUTS, diagonal metric, dense-covariance Gaussian (cond 1e4)',
      value: 100 * ratio(honest),
      unit: '%',
      digits: 2,
      target: { op: '<', limit: 10 },
      note: `step ${ns(honest.step)} vs gradient ${ns(honest.gradient)}; ${honest.stepsPerDraw.toFixed(0)} steps per draw, ${honest.steps} steps timed`,
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

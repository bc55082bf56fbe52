/**
 * NUTS against a gradient-free baseline, the adaptive random-walk Metropolis of
 * bench/baseline/adaptiveMetropolis.ts (Haario et al. 2001), on the same targets,
 * from the same starting points, with the same time budget.
 *
 * Targets: the 100-D Gaussian with condition number 1e4 and a random rotation (NUTS with
 * the dense metric, which that posterior calls for; the baseline adapts a full
 * covariance too); the demo's joint RV + transit model (examples/demo/demoModel.ts: two
 * planets, one transiting, two spectrographs, a 30-minute-cadence light curve with
 * exposure averaging, 23 coordinates); and the two-planet RV model of
 * bench/support/modelScenarios.ts. NUTS runs on the builders' centred and scaled
 * coordinates with the demo's dense metric on the demo's model, and with the default
 * diagonal metric and with a dense one on the RV model (the baseline adapts a full
 * covariance).
 *
 * Chains: four on the joint models. The bulk ESS of split, rank-normalised chains counts
 * disagreement between chains; from a single chain it cannot, and a baseline chain that
 * has not yet crossed the posterior can then report a large ESS (measured on the demo's
 * model with one chain of 400 + 400 NUTS iterations as the budget: the baseline's ESS
 * ranged 18–61 between seeds, the ratio 2.2–8.2x; with four chains 10–26, 29–77x).
 * The demo's model runs at the demo's own settings (see `run`), five replicas.
 *
 * Procedure per target: NUTS runs `chains` chains (warmup + draws) in this thread and
 * its process CPU time T is the budget; the baseline then runs the same number of
 * chains, each for T / chains CPU seconds, keeping the second half of its iterations.
 * The figure is the smallest bulk-ESS over all parameters (`bulkEss` of
 * @apsis/diagnostics, rank-normalised split chains) per CPU second of the whole run,
 * warmup included, for both, and their ratio. For the models the parameters are the
 * physical values of the sampled parameters (the trace columns the builders report,
 * e.g. |b| for the impact parameter), computed from both samplers' draws alike; for
 * the Gaussian they are the coordinates. ESS per gradient counts NUTS's
 * sampling-phase gradient evaluations; the baseline's ESS per density evaluation is
 * shown beside it. The baseline calls the same `logDensityGrad` (it ignores the
 * gradient); a value-only path of the shipped likelihoods is at most about 1.4 times
 * cheaper (measured), which would not change any verdict.
 *
 * Run: npx tsx --conditions=source bench/suite-baseline.ts [--quick]
 */
import { createRandomStream, runChains, type RunOptions, type Target } from '@apsis/core';
import { runAdaptiveMetropolis } from './baseline/adaptiveMetropolis.js';
import { cpuSeconds } from './support/cpuTime.js';
import { runIfMain, type Figure, type SuiteOptions, type SuiteResult } from './support/figures.js';
import { rotatedGaussian } from './support/gaussianTargets.js';
import { median } from './support/median.js';
import { minParameterEss } from './support/parameterEss.js';
import { buildDemoModel } from '../examples/demo/demoModel.js';
import { jointScenario, rvScenario } from './support/modelScenarios.js';

export interface Comparison {
  readonly label: string;
  readonly dim: number;
  readonly nuts: { ess: number; seconds: number; gradients: number; samplingGradients: number; divergences: number };
  readonly baseline: { ess: number; seconds: number; evaluations: number; acceptance: number; thin: number };
}

/** Starting points uniform in (−2, 2) in every coordinate, from a seeded stream. */
function starts(dim: number, chains: number, seedText: string): Float64Array[] {
  const rng = createRandomStream(seedText);
  return Array.from({ length: chains }, () => Float64Array.from({ length: dim }, () => 4 * rng.uniform() - 2));
}

/** Runs NUTS and then the baseline with NUTS's CPU time as the budget. */
export async function compare(label: string, target: Target, options: RunOptions & { chains: number; seed: number }): Promise<Comparison> {
  const dim = target.dim;
  const init = starts(dim, options.chains, `apsis bench starts ${label}`);
  // Both samplers' first calls pay for compiling the target's code; warm it up first.
  const g = new Float64Array(dim);
  for (let k = 0; k < 50; k++) target.logDensityGrad(init[k % init.length], g);
  const t0 = cpuSeconds();
  const run = await runChains(target, { ...options, init, keepWarmup: true });
  const seconds = cpuSeconds() - t0;
  const sum = (cols: readonly Int32Array[]): number => cols.reduce((s, c) => s + c.reduce((a, b) => a + b, 0), 0);
  const samplingGradients = sum(run.stats.map((s) => s.leapfrogSteps));
  const gradients = samplingGradients + sum(run.warmup!.stats.map((s) => s.leapfrogSteps));
  const nutsEss = minParameterEss(target, run.draws);
  const am = init.map((start, c) =>
    runAdaptiveMetropolis(target, { seed: `apsis bench am ${options.seed} chain ${c}`, init: start, seconds: seconds / options.chains }),
  );
  const amEss = minParameterEss(target, am.map((r) => r.draws));
  return {
    label,
    dim,
    nuts: { ess: nutsEss, seconds, gradients, samplingGradients, divergences: run.divergences.reduce((a, b) => a + b, 0) },
    baseline: {
      ess: amEss,
      seconds: am.reduce((s, r) => s + r.seconds, 0),
      evaluations: am.reduce((s, r) => s + r.densityEvaluations, 0),
      acceptance: am.reduce((s, r) => s + r.acceptance, 0) / am.length,
      thin: Math.max(...am.map((r) => r.thin)),
    },
  };
}

/**
 * Runs `replicas` comparisons with their own starting points and seeds: the baseline's
 * ESS at a budget of a few tens of seconds depends on whether its covariance adaptation
 * has settled (measured on the demo's model: 10–115 ESS between seeds), so one replica
 * can show anything from a few times to tens of times; the figure is the median ratio.
 */
export async function compareReplicated(label: string, target: Target, options: RunOptions & { chains: number; seed: number }, replicas: number): Promise<Comparison[]> {
  const out: Comparison[] = [];
  for (let r = 0; r < replicas; r++) {
    out.push(await compare(replicas === 1 ? label : `${label} #${r + 1}`, target, { ...options, seed: options.seed + 1000 * r }));
  }
  return out.map((c) => ({ ...c, label }));
}

function figuresOf(cs: readonly Comparison[], target: number | null): Figure[] {
  const c = cs[0];
  const rate = (x: Comparison): [number, number] => [x.nuts.ess / x.nuts.seconds, x.baseline.ess / x.baseline.seconds];
  const ratios = cs.map((x) => rate(x)[0] / rate(x)[1]);
  const group = 'NUTS vs adaptive Metropolis (min bulk-ESS per CPU second, same budget)';
  const describe = (x: Comparison): string => {
    const [nutsRate, amRate] = rate(x);
    return (
      `NUTS ${x.nuts.ess.toFixed(0)} ESS in ${x.nuts.seconds.toFixed(1)} s = ${nutsRate.toFixed(1)}/s ` +
      `(${(x.nuts.ess / x.nuts.samplingGradients).toExponential(2)} per sampling gradient, ${x.nuts.divergences} divergences); ` +
      `baseline ${x.baseline.ess.toFixed(1)} ESS in ${x.baseline.seconds.toFixed(1)} s = ${amRate.toFixed(2)}/s ` +
      `(${(x.baseline.ess / x.baseline.evaluations).toExponential(2)} per density evaluation, acceptance ${x.baseline.acceptance.toFixed(2)}, thinned by ${x.baseline.thin})`
    );
  };
  const perGradient = cs.map((x) => x.nuts.ess / x.nuts.samplingGradients);
  return [
    {
      group,
      name: `${c.label}: NUTS / baseline${cs.length > 1 ? ` (median of ${cs.length})` : ''}`,
      value: median(ratios),
      unit: 'x',
      ...(target === null ? {} : { target: { op: '>=' as const, limit: target } }),
      note: cs.length === 1 ? describe(c) : cs.map((x, r) => `#${r + 1}: ${ratios[r].toFixed(2)}x; ${describe(x)}`).join('\n      '),
    },
    {
      group: 'ESS per gradient (NUTS, sampling phase)',
      name: `${c.label}`,
      value: median(perGradient),
      unit: '',
      note: cs
        .map((x) => `${x.nuts.samplingGradients} gradients for ${x.nuts.ess.toFixed(0)} ESS; whole run incl. warmup ${(x.nuts.ess / x.nuts.gradients).toExponential(2)}`)
        .join('\n      '),
    },
  ];
}

/** Runs the baseline comparison suite. */
export async function run(options: SuiteOptions): Promise<SuiteResult> {
  const start = performance.now();
  const q = options.quick;
  const comparisons: [Comparison[], number | null][] = [];
  const gaussian = rotatedGaussian(100, 1e4, 'apsis bench gaussian');
  comparisons.push([
    [await compare('100-D Gaussian, cond 1e4, rotated', gaussian.target, { chains: q ? 1 : 2, warmup: q ? 500 : 1000, draws: q ? 300 : 1000, seed: 101, metric: 'dense' })],
    100,
  ]);
  if (q) {
    // The demo's model costs about 8 s of NUTS per 1000 iterations; the quick run uses
    // the lighter joint scenario of the gradient suite instead.
    const joint = await jointScenario({ lightCurvePoints: 2000 });
    // No target: the issue's target is for the demo's model. This scenario has no stellar
    // density prior and 2-minute exposures of a shallow transit, so b, ρ and the limb
    // darkening trade off along a curved ridge that limits NUTS's step size (measured
    // 3.0x here on 2026-12-01).
    comparisons.push([[await compare('joint RV + transit (scenario, N = 2000 + 50)', joint, { chains: 4, warmup: 300, draws: 300, seed: 102 })], null]);
  } else {
    const demo = await buildDemoModel();
    // NUTS as the demo runs it: dense metric, 4 chains × (1000 + 1000). With half that
    // (500 + 500) the baseline's budget ends before its covariance adaptation has
    // settled, and the ratio then says more about that transient than about either
    // sampler: 5.4–38x over six replicas, against 4.6–4.8x at the demo's settings
    // (measured 2026-12-01). Since the impact parameter's stretched coordinate NUTS takes
    // about 40 s instead of 43–53 s here, and even at these settings the baseline's budget
    // ends unsettled in some replicas (21–170 ESS against 300–520 when settled; replicas
    // 3.4x to 79x, settled ones 3.4x to 6.1x, on 2026-12-01): read the replicas' notes.
    // Five replicas, not three: with NUTS's draws the same in two runs (2026-12-02, runs
    // K and L) the median of three moved from 9.6x to 23x with the baseline's luck alone.
    comparisons.push([await compareReplicated("demo's joint RV + transit model, demo's settings", demo, { chains: 4, warmup: 1000, draws: 1000, seed: 102, metric: 'dense' }, 5), 10]);
    // The same model in a long run, where the warmup (more than half of the gradients at
    // the demo's settings) weighs less and the baseline's adaptation has long settled:
    // for information, since the target row above is the demo's own run. Three replicas
    // of about 2.5 minutes each (2026-12-02: 10.9x, 6.44x, 6.74x; with other starting
    // points 9.95x, 11.05x, 8.13x).
    comparisons.push([await compareReplicated("demo's joint RV + transit model, long run (1000 + 5000)", demo, { chains: 4, warmup: 1000, draws: 5000, seed: 102, metric: 'dense' }, 3), null]);
  }
  const rv = await rvScenario({ points: 200 });
  comparisons.push([[await compare('2-planet RV (N = 200)', rv, { chains: 2, warmup: q ? 300 : 1000, draws: q ? 300 : 1000, seed: 103 })], null]);
  // The baseline adapts a full covariance; NUTS with a dense metric is the like-for-like
  // comparison where the posterior has linear correlations (here tc and √e cos ω of the
  // eccentric outer planet, correlation about −0.7).
  comparisons.push([[await compare('2-planet RV (N = 200), dense metric', rv, { chains: 2, warmup: q ? 300 : 1000, draws: q ? 300 : 1000, seed: 103, metric: 'dense' })], null]);
  const all = comparisons.flatMap(([c, t]) => figuresOf(c, t));
  // Ratios first, then ESS per gradient.
  const figures = [...all.filter((f) => f.group.startsWith('NUTS')), ...all.filter((f) => !f.group.startsWith('NUTS'))];
  return { suite: 'baseline', figures, details: [], seconds: (performance.now() - start) / 1000 };
}

await runIfMain(import.meta.url, run);

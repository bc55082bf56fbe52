/**
 * Parallel chains on the shipped models: 4 chains on 2 worker threads against the same 4
 * chains on 1 worker thread, through the runner (`executeRun` of @apsis/core) with the
 * models rebuilt in each worker from a recipe (bench/support/modelScenarios.ts). The
 * serial reference is one worker, not the calling thread: both then start with code that
 * V8 has not compiled yet, whereas the calling thread is warm from the earlier repeats
 * (the calling thread's figure is shown beside it).
 * The figure is the ratio of the runs' own sampling clocks (`timing.sampling`, from the
 * moment every chain is ready to the end: worker start-up and model building excluded),
 * formed within each repeat, median over repeats; end-to-end times and the cores the run
 * obtained (CPU seconds of this process and its threads per wall second) are shown beside
 * it, and the draws must be identical. Wall-clock time, since threads pay off only there.
 * Beside each model's figure the suite measures, in the same rotation of repeats, what
 * two workers gain over one for a loop of plain arithmetic that shares nothing
 * (bench/support/arithmeticCeiling.ts): the machine's own ceiling for the figure.
 * The runner's own benchmark (bench/runner-parallel.ts) covers TensorFlow.js targets and
 * the cost of streaming traces to disk.
 *
 * Run: npx tsx --conditions=source bench/suite-parallel.ts [--quick]
 */
import { loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { executeRun, type LongRunResult, type TargetRecipe } from '@apsis/core';
import { runIfMain, type Figure, type SuiteOptions, type SuiteResult } from './support/figures.js';
import { calibrateIterations, ceilingRatio } from './support/arithmeticCeiling.js';
import { median } from './support/median.js';

const scenarios = fileURLToPath(new URL('./support/modelScenarios.ts', import.meta.url));

const same = (a: LongRunResult, b: LongRunResult): boolean =>
  a.draws.length === b.draws.length && a.draws.every((d, c) => d.length === b.draws[c].length && d.every((x, i) => Object.is(x, b.draws[c][i])));

interface SpeedUp {
  /** Median over repeats of (1 worker's sampling clock) / (2 workers'). */
  readonly sampling: number;
  /** The same ratio in each repeat. */
  readonly ratios: number[];
  /** Median over repeats of (calling thread's sampling clock) / (2 workers'). */
  readonly inThread: number;
  readonly endToEnd: number;
  readonly one: LongRunResult[];
  readonly two: LongRunResult[];
  readonly cores: number;
  readonly identical: boolean;
  /** The arithmetic loop's 2-worker ratio in each repeat (the machine's ceiling). */
  readonly ceilings: number[];
}

/**
 * Repeats of three runs of the same 4 chains: in one worker thread, on two worker
 * threads, and in the calling thread, in an order that rotates between repeats so that
 * a slow spell of the machine does not always fall on the same kind. Each ratio is
 * formed within one repeat; the figure is their median.
 */
async function speedUp(recipe: TargetRecipe, iterations: { warmup: number; draws: number }, repeats: number, loop: number): Promise<SpeedUp> {
  const base = { ...iterations, chains: 4, seed: 21, progress: false };
  const wall = (r: LongRunResult): number => r.timing.startup + r.timing.sampling;
  const one: LongRunResult[] = [];
  const two: LongRunResult[] = [];
  const here: LongRunResult[] = [];
  const ceilings: number[] = [];
  let cores = 0;
  const kinds = [
    async () => ceilings.push(await ceilingRatio(loop)),
    async () => one.push(await executeRun(recipe, { ...base, threads: 1 })),
    async () => {
      const c0 = process.cpuUsage();
      const p = await executeRun(recipe, { ...base, threads: 2 });
      const c = process.cpuUsage(c0);
      cores = Math.max(cores, (c.user + c.system) / 1e6 / wall(p));
      two.push(p);
    },
    async () => here.push(await executeRun(recipe, { ...base, threads: 0 })),
  ];
  for (let k = 0; k < repeats; k++) for (let j = 0; j < kinds.length; j++) await kinds[(j + k) % kinds.length]();
  const ratios = one.map((r, k) => r.timing.sampling / two[k].timing.sampling);
  const all = [...one, ...two, ...here];
  return {
    sampling: median(ratios),
    ratios,
    inThread: median(here.map((r, k) => r.timing.sampling / two[k].timing.sampling)),
    endToEnd: median(one.map((r, k) => wall(r) / wall(two[k]))),
    one,
    two,
    cores,
    identical: all.every((r) => same(all[0], r)),
    ceilings,
  };
}

/** Runs the parallel suite. */
export async function run(options: SuiteOptions): Promise<SuiteResult> {
  const start = performance.now();
  const q = options.quick;
  const load = loadavg()[0];
  const cases: [string, TargetRecipe, { warmup: number; draws: number }, number][] = [
    // Median of five repeats: the same chain run again in one warm worker took 1.71 to
    // 2.30 s (measured 2026-12-01, 15 runs), so a single ratio moves by ±20%; best-of-k
    // favoured the serial side, whose best run was also its warmest.
    // Runs of 5 to 11 s of sampling, so that each worker's compiling of the code is a
    // small part of its run.
    ['joint RV + transit (N = 2000 + 50)', { module: scenarios, exportName: 'jointScenario', args: { lightCurvePoints: 2000 } }, q ? { warmup: 200, draws: 200 } : { warmup: 400, draws: 400 }, q ? 1 : 5],
    ['2-planet RV (N = 200)', { module: scenarios, exportName: 'rvScenario', args: { points: 200 } }, q ? { warmup: 300, draws: 300 } : { warmup: 1000, draws: 1000 }, q ? 1 : 5],
  ];
  const figures: Figure[] = [];
  // About 1.5 s per unit: long against a worker's start, short against the model runs.
  const loop = await calibrateIterations(1.5);
  const ceilings: number[] = [];
  for (const [label, recipe, iterations, repeats] of q ? cases.slice(1) : cases) {
    const s = await speedUp(recipe, iterations, repeats, loop);
    ceilings.push(...s.ceilings);
    const clocks = (rs: readonly LongRunResult[]): string => rs.map((r) => r.timing.sampling.toFixed(2)).join(', ');
    figures.push({
      group: 'parallel chains: 2 worker threads vs 1 (4 chains)',
      name: `${label}, sampling${s.ratios.length > 1 ? ` (median of ${s.ratios.length})` : ''}`,
      value: s.sampling,
      unit: 'x',
      target: { op: '>=', limit: 1.8 },
      note:
        `per repeat ${s.ratios.map((r) => r.toFixed(2)).join(', ')}x; sampling clocks ${clocks(s.one)} s on 1 worker, ${clocks(s.two)} s on 2; ` +
        `machine ceiling in the same repeats ${s.ceilings.map((r) => r.toFixed(2)).join(', ')}x (median ${median(s.ceilings).toFixed(2)}x; this figure is ${(s.sampling / median(s.ceilings)).toFixed(2)} of it); ` +
        `calling thread / 2 workers ${s.inThread.toFixed(2)}x; end to end ${s.endToEnd.toFixed(2)}x (start-up ${s.two[0].timing.startup.toFixed(2)} s on 2 workers); ` +
        `cores obtained ${s.cores.toFixed(2)}; draws identical: ${s.identical ? 'yes' : 'NO'}; load average ${load.toFixed(2)} before`,
    });
    if (!s.identical) throw new Error(`${label}: parallel draws differ from serial draws`);
  }
  figures.push({
    group: 'parallel chains: 2 worker threads vs 1 (4 chains)',
    name: `machine ceiling: arithmetic loop sharing nothing, 2 workers vs 1 (median of ${ceilings.length})`,
    value: median(ceilings),
    unit: 'x',
    note: `per repeat ${ceilings.map((r) => r.toFixed(2)).join(', ')}x, measured between the model repeats above; the ceiling the model figures above are held against (single repeats of either scatter by about ±15%)`,
  });
  return { suite: 'parallel', figures, details: [], seconds: (performance.now() - start) / 1000 };
}

await runIfMain(import.meta.url, run);

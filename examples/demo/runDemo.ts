/**
 * The apsis demo from end to end: simulate the invented system's observations, build
 * the joint radial-velocity + transit model, sample it with NUTS (chains on worker
 * threads, progress on a terminal, every draw streamed to a run folder), print the
 * parameter table with derived quantities and the diagnostics verdict, and write the
 * HTML report. `main(options)` runs it; tests run a small version through it.
 */
import { existsSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defaultThreads, drawsByName, executeRun, type LongRunResult } from '@apsis/core';
import {
  convergenceVerdict,
  samplerHealth,
  summarize,
  type ConvergenceVerdict,
  type SummaryTable,
} from '@apsis/diagnostics';
import { fitPanels } from '@apsis/models';
import { writeReport } from '@apsis/report';
import { buildDemoModel } from './demoModel.js';
import { demoReportInput } from './demoReport.js';
import { demoSections, formatParameterTable, TABLE_QUANTILES } from './parameterTable.js';
import { photometer, planets, spectrographs, star } from './scenario.js';
import { simulateObservations } from './simulateObservations.js';
import { trueColumns } from './trueValues.js';
import { verdictText } from './verdictText.js';

/** The repository root (the demo writes below it by default). */
const repositoryRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');

/** Points per model curve of the velocities-against-time panel. */
const TIME_SERIES_POINTS = 4000;

/** The label stored in the demo's run folders; only folders with it are replaced. */
export const DEMO_RUN_LABEL = 'apsis demo: Orvanne joint RV + transit fit';

/** Options of {@link main}. */
export interface DemoOptions {
  /** Chains (default 4). */
  readonly chains?: number;
  /** Warmup iterations per chain (default 1000). */
  readonly warmup?: number;
  /** Draws per chain after warmup (default 1000). */
  readonly draws?: number;
  /** Run seed (default 20410). */
  readonly seed?: number;
  /** Worker threads (default: one per core, at most one per chain; 0: this thread). */
  readonly threads?: number;
  /** Print nothing and draw no progress (the text is still returned). */
  readonly quiet?: boolean;
  /** Folder of the report (default `reports/demo` in the repository). */
  readonly outDir?: string;
  /** Run folder for traces and checkpoints (default `runs/demo` in the repository; `null`: none). */
  readonly runDir?: string | null;
}

/** What {@link main} returns. */
export interface DemoResult {
  /** Everything the demo printed (or would have printed, when quiet). */
  readonly text: string;
  /** The parameter table alone. */
  readonly table: string;
  readonly summary: SummaryTable;
  readonly verdict: ConvergenceVerdict;
  /** True values of every trace column. */
  readonly truth: Readonly<Record<string, number>>;
  /** Absolute path of report.html. */
  readonly reportPath: string;
  /** Absolute path of the run folder, or null. */
  readonly runFolder: string | null;
  readonly run: LongRunResult;
  /** Wall-clock seconds of the whole demo. */
  readonly seconds: number;
}

/** A demo option that is out of range, named with its value and what was expected. */
export class DemoOptionsError extends Error {
  constructor(
    readonly field: string,
    readonly value: unknown,
    readonly expected: string,
  ) {
    super(`demo: option \`${field}\` = ${JSON.stringify(value) ?? String(value)}: expected ${expected}`);
    this.name = 'DemoOptionsError';
  }
}

/** Each option's check and what it expects (the workspace root has no zod: checked by hand). */
const optionChecks: Record<keyof DemoOptions, [(v: unknown) => boolean, string]> = {
  chains: [(v) => Number.isInteger(v) && (v as number) >= 1 && (v as number) <= 64, 'an integer from 1 to 64'],
  warmup: [(v) => Number.isInteger(v) && (v as number) >= 20 && (v as number) <= 1e6, 'an integer from 20 to 1e6'],
  draws: [(v) => Number.isInteger(v) && (v as number) >= 8 && (v as number) <= 1e7, 'an integer from 8 (4 in each split half) to 1e7'],
  seed: [(v) => Number.isSafeInteger(v) && (v as number) >= 0, 'a safe integer >= 0'],
  threads: [(v) => Number.isInteger(v) && (v as number) >= 0 && (v as number) <= 256, 'an integer from 0 to 256'],
  quiet: [(v) => typeof v === 'boolean', 'true or false'],
  outDir: [(v) => typeof v === 'string' && v.length > 0, 'a non-empty path'],
  runDir: [(v) => v === null || (typeof v === 'string' && v.length > 0), 'a non-empty path or null'],
};

function checkOptions(options: unknown): DemoOptions {
  if (options === null || typeof options !== 'object' || Array.isArray(options)) {
    throw new DemoOptionsError('options', options, 'an object');
  }
  for (const [key, value] of Object.entries(options)) {
    if (value === undefined) continue;
    const check = optionChecks[key as keyof DemoOptions];
    if (!check) throw new DemoOptionsError(key, value, `no such option; the options are ${Object.keys(optionChecks).join(', ')}`);
    if (!check[0](value)) throw new DemoOptionsError(key, value, check[1]);
  }
  return options as DemoOptions;
}

/**
 * Empties `folder` for a new run: it may be missing, empty, or a run folder the demo
 * wrote before (its manifest carries {@link DEMO_RUN_LABEL}); anything else is left
 * alone and reported.
 */
function clearDemoRunFolder(folder: string): void {
  if (!existsSync(folder) || readdirSync(folder).length === 0) return;
  const manifest = path.join(folder, 'apsis-run.json');
  let label: unknown = null;
  try {
    label = (JSON.parse(readFileSync(manifest, 'utf8')) as { label?: unknown }).label;
  } catch {
    // not a run folder: refuse below
  }
  if (label !== DEMO_RUN_LABEL) {
    throw new DemoOptionsError('runDir', folder, 'a new or empty folder, or a run folder of an earlier demo run (this one holds something else)');
  }
  rmSync(folder, { recursive: true, force: true });
}

/** Runs the demo (see the file notes); resolves when the report is written. */
export async function main(options: DemoOptions = {}): Promise<DemoResult> {
  const started = performance.now();
  const o = checkOptions(options);
  const chains = o.chains ?? 4;
  const warmup = o.warmup ?? 1000;
  const draws = o.draws ?? 1000;
  const seed = o.seed ?? 20410;
  const quiet = o.quiet ?? false;
  const outDir = o.outDir === undefined ? path.join(repositoryRoot, 'reports', 'demo') : path.resolve(o.outDir);
  const runDir = o.runDir === null ? null : o.runDir === undefined ? path.join(repositoryRoot, 'runs', 'demo') : path.resolve(o.runDir);
  const threads = o.threads ?? defaultThreads(chains);
  const metric = 'dense';
  const maxTreeDepth = 10;
  const targetAcceptance = 0.9;

  const printed: string[] = [];
  const say = (text: string): void => {
    printed.push(text);
    if (!quiet) process.stdout.write(text.endsWith('\n') ? text : `${text}\n`);
  };
  const where = (p: string): string => (path.relative(process.cwd(), p).startsWith('..') ? p : path.relative(process.cwd(), p) || '.');

  say(`apsis demo: a joint radial-velocity + transit fit of ${star.name}, an invented star with two planets`);
  const observations = simulateObservations();
  const rvTimes = Float64Array.from(observations.rv.times);
  const instrument = observations.rv.instrument;
  const rvCount = (label: string): number =>
    typeof instrument === 'string' ? (instrument === label ? rvTimes.length : 0) : instrument.filter((l) => l === label).length;
  say(
    `data (simulated with a fixed seed): ${rvTimes.length} radial velocities over ${Math.round(rvTimes[rvTimes.length - 1] - rvTimes[0])} days from ${spectrographs
      .map((s) => `${s.name} (${rvCount(s.label)})`)
      .join(' and ')};`,
  );
  say(
    `  ${observations.lightCurve.times.length} photometric points over ${Math.round(photometer.end - photometer.start)} days from the ${photometer.name}, ${Math.round(photometer.exposureTime * 1440)}-minute exposures`,
  );

  // The model in this thread (for the table, truth and plots); workers rebuild the same
  // model from the recipe (same data, same mode search: deterministic).
  const model = await buildDemoModel(null);
  const backend = model.structure.compiled.backend;
  const computation = backend === null ? 'fused float64 JavaScript kernels (no TensorFlow.js needed)' : `TensorFlow.js backend "${backend}"`;
  say(
    `model: ${planets.length} planets, ${model.dim} sampled parameters, ${model.outputs.names.length} recorded quantities; computation: ${computation}`,
  );
  say(
    `sampler: NUTS, ${metric} metric, ${chains} chains × (${warmup} warmup + ${draws} draws), seed ${seed}, ${threads === 0 ? 'in this thread' : `${threads} worker thread${threads > 1 ? 's' : ''}`}`,
  );
  if (runDir !== null) clearDemoRunFolder(runDir);

  const recipe = { module: fileURLToPath(new URL('./demoModel.ts', import.meta.url)), exportName: 'buildDemoModel', args: null };
  const run = await executeRun(recipe, {
    chains,
    warmup,
    draws,
    seed,
    metric,
    maxTreeDepth,
    targetAcceptance,
    threads,
    label: DEMO_RUN_LABEL,
    ...(runDir !== null ? { folder: runDir } : {}),
    ...(quiet ? { progress: false } : {}),
  });
  say(`sampling took ${run.elapsed.toFixed(1)} s (start-up ${run.timing.startup.toFixed(1)} s)`);

  const byName = drawsByName(run);
  const summary = summarize(byName, { quantiles: TABLE_QUANTILES });
  const health = samplerHealth(run.stats, { maxTreeDepth });
  const verdict = convergenceVerdict(summary, health);
  const truth = trueColumns(model);
  const table = formatParameterTable(summary, demoSections(model.epoch), truth);
  say('');
  say('Posterior (median and central 68% interval; "true" is what the data were simulated from):');
  say(table);
  say(verdictText(summary, health, verdict));

  // Data and model (`fitPanels` of @apsis/models; its first panel is the velocities
  // against time, then each planet's folded velocities, then the folded transit): 40
  // posterior model draws per folded panel; the 470-day time series needs finer curves
  // (about 8 points per day for a 4.3-day orbit), so it gets 6 draws of 4000 points.
  const [timeSeries] = fitPanels(model, run, { maxDraws: 6, curvePoints: TIME_SERIES_POINTS });
  const fits = [timeSeries, ...fitPanels(model, run).slice(1)];
  const input = demoReportInput(
    model,
    run,
    {
      title: `${star.name}: joint radial-velocity and transit fit`,
      seed,
      warmup,
      draws,
      metric,
      maxTreeDepth,
      targetAcceptance,
      backend: computation,
      elapsedSeconds: run.elapsed,
      notes: [
        `${star.name}, its planets and the instruments are invented; the data were simulated with a fixed seed (examples/demo/scenario.ts).`,
        'The priors are the model builders\u2019 defaults, plus normal priors on the stellar mass, radius and mean density from the stated mass and radius.',
        'Diagnostics can show a problem but cannot prove convergence; the posterior depends on the priors stated.',
      ],
    },
    fits,
    { curvePoints: TIME_SERIES_POINTS },
  );
  const reportPath = await writeReport(input, outDir);
  say(`report: ${where(reportPath)}`);
  if (runDir !== null) {
    say(`run folder: ${where(runDir)}   (check it again: npx apsis summary ${where(runDir)})`);
  }
  const seconds = (performance.now() - started) / 1000;
  say(`done in ${seconds.toFixed(1)} s`);
  return { text: printed.join('\n') + '\n', table, summary, verdict, truth, reportPath, runFolder: runDir, run, seconds };
}

/**
 * Runner benchmarks, printed as ratios measured in one run.
 *
 * 1. Speed-up of 2 worker threads over the calling thread, 4 chains, for a fused float64
 *    JS target and for the same model with a TensorFlow.js likelihood (modelling layer,
 *    default backend). "end to end" includes starting the workers and building the
 *    targets (and, for the serial TensorFlow.js run, importing TensorFlow.js once);
 *    "sampling only" compares the runs' own `timing.sampling` (from the moment every
 *    chain is ready to the end).
 * 2. Overhead of streaming traces to a run folder and checkpointing, as a fraction of
 *    the run time without a folder (fused target, calling thread, best of 2).
 *
 * Times are wall-clock seconds (worker threads only pay off in wall time), best of 2
 * interleaved repeats (1 with --quick); the load average is printed before and after.
 *
 * Run: npx tsx --conditions=source bench/runner-parallel.ts [--quick]
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { loadavg, tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { executeRun, readManifest, type ExecuteRunOptions, type LongRunResult, type TargetRecipe } from '@apsis/core';
import { readLatestCheckpoint, writeCheckpoint } from '../packages/core/src/runner/checkpointStore.js';
import { createRowBlock } from '../packages/core/src/runner/rowBlock.js';
import { openTraceWriter } from '../packages/core/src/runner/traceWriter.js';
import { sinusoidInit } from './runner-targets.js';

const quick = process.argv.includes('--quick');
const module = fileURLToPath(new URL('./runner-targets.ts', import.meta.url));
const root = mkdtempSync(join(tmpdir(), 'apsis-bench-runner-'));

async function seconds(run: () => Promise<unknown>): Promise<{ s: number; value: unknown }> {
  const t0 = performance.now();
  const value = await run();
  return { s: (performance.now() - t0) / 1000, value };
}

const same = (a: { draws: Float64Array[] }, b: { draws: Float64Array[] }): boolean =>
  a.draws.length === b.draws.length && a.draws.every((d, c) => d.length === b.draws[c].length && d.every((x, i) => Object.is(x, b.draws[c][i])));

async function speedUp(label: string, recipe: TargetRecipe, options: ExecuteRunOptions): Promise<void> {
  const base = { ...options, chains: 4, seed: 11, init: sinusoidInit(4), progress: false };
  const wall = (r: LongRunResult) => r.timing.startup + r.timing.sampling;
  // Serial first: in a fresh process, it pays any one-off import (TensorFlow.js) in this
  // thread. Then interleaved repeats, the best of each kept, so a burst of load from
  // other work on the machine hits both alike.
  const serials: LongRunResult[] = [];
  const parallels: LongRunResult[] = [];
  const cores = { serial: 0, parallel: 0 };
  // CPU seconds of this process (all its threads) per wall second: how many cores the run got.
  const measured = async (threads: number): Promise<LongRunResult> => {
    const c0 = process.cpuUsage();
    const r = await executeRun(recipe, { ...base, threads });
    const c = process.cpuUsage(c0);
    const used = (c.user + c.system) / 1e6 / wall(r);
    if (threads === 0) cores.serial = Math.max(cores.serial, used);
    else cores.parallel = Math.max(cores.parallel, used);
    return r;
  };
  for (let k = 0; k < (quick ? 1 : 2); k++) {
    serials.push(await measured(0));
    parallels.push(await measured(2));
  }
  const identical = parallels.every((p) => same(serials[0], p)) && serials.every((s) => same(serials[0], s));
  const bestSampling = Math.min(...serials.map((r) => r.timing.sampling));
  const serial: LongRunResult = { ...serials[0], timing: { startup: serials[0].timing.startup, sampling: bestSampling } };
  const parallel = parallels.reduce((a, b) => (wall(b) < wall(a) ? b : a));
  console.log(
    `${label}: serial ${wall(serial).toFixed(2)} s (start-up ${serial.timing.startup.toFixed(2)} s), 2 workers ${wall(parallel).toFixed(2)} s (start-up ${parallel.timing.startup.toFixed(2)} s)`,
  );
  console.log(
    `  speed-up, end to end ${(wall(serial) / wall(parallel)).toFixed(2)}x, sampling only ${(serial.timing.sampling / parallel.timing.sampling).toFixed(2)}x; draws identical: ${identical ? 'yes' : 'NO'}`,
  );
  console.log(`  cores obtained (CPU s / wall s, best run): serial ${cores.serial.toFixed(2)}, 2 workers ${cores.parallel.toFixed(2)} (an idle machine gives 1 and about 2)`);
}

async function overhead(): Promise<void> {
  const recipe = { module, exportName: 'fusedSinusoid', args: { n: 1000 } };
  const base = { chains: 2, warmup: quick ? 500 : 1000, draws: quick ? 1000 : 6000, seed: 5, init: sinusoidInit(2), progress: false, threads: 0 };
  let n = 0;
  const folder = () => join(root, `run-${n++}`);
  const variants: (() => ExecuteRunOptions)[] = [
    () => ({}),
    () => ({ folder: folder(), checkpointEvery: 0 }),
    () => ({ folder: folder() }),
    () => ({ folder: folder(), checkpointEvery: 50, minCheckpointSeconds: 0 }),
  ];
  // Interleaved repeats, best of 3 each, so a burst of load elsewhere hits all variants alike.
  const best = variants.map(() => Infinity);
  for (let k = 0; k < 3; k++) {
    for (const [i, v] of variants.entries()) best[i] = Math.min(best[i], (await seconds(() => executeRun(recipe, { ...base, ...v() }))).s);
  }
  const [plain, streamed, defaults, every50] = best;
  const frac = (t: number) => `${(((t - plain) / plain) * 100).toFixed(1)}%`;
  console.log(`streaming and checkpoints (fused target, ${base.chains} chains x ${base.warmup + base.draws} iterations, ${plain.toFixed(2)} s without a folder):`);
  const total = base.warmup + base.draws;
  const perCheckpoint = ((every50 - streamed) / Math.floor(total / 50)) * 1000;
  console.log(`  traces only ${frac(streamed)}, + default checkpoints (every 500 iterations, at least 10 s apart) ${frac(defaults)}, + every 50 iterations ${frac(every50)}`);
  console.log(`  about ${perCheckpoint.toFixed(2)} ms per checkpoint (${base.chains} chains; from the every-50 run)`);

  // Direct costs, less sensitive to other load: one checkpoint (fsync of the traces, then
  // the atomic write), and formatting plus appending one trace row.
  const dir = folder();
  await executeRun(recipe, { ...base, warmup: 20, draws: 20, folder: dir, checkpointEvery: 10, minCheckpointSeconds: 0 });
  const manifest = readManifest(dir);
  const { checkpoint } = readLatestCheckpoint(dir, manifest);
  const writers = manifest.traces.map((t, c) => openTraceWriter(join(dir, t), '', manifest.dim, manifest.columns.outputs.length, { bytes: checkpoint!.chains[c].traceBytes, rows: checkpoint!.chains[c].rows }));
  const times: number[] = [];
  for (let k = 0; k < 40; k++) {
    const t0 = performance.now();
    for (const w of writers) w.sync();
    writeCheckpoint(dir, manifest, { ...checkpoint!, generation: checkpoint!.generation + 1 + k });
    times.push(performance.now() - t0);
  }
  times.sort((a, b) => a - b);
  const block = createRowBlock(0, checkpoint!.iteration, 1000, manifest.dim, 0);
  block.count = 1000;
  const t1 = performance.now();
  for (let k = 0; k < 20; k++) writers[0].append({ ...block, first: block.first + k * 1000 });
  const perRow = ((performance.now() - t1) / 20000) * 1000;
  for (const w of writers) w.close();
  const perIteration = (plain / (base.chains * total)) * 1e6;
  console.log(
    `  direct: one checkpoint ${times[20].toFixed(2)} ms (median of 40, ${base.chains} chains), one trace row ${perRow.toFixed(2)} µs; this target takes ${perIteration.toFixed(0)} µs per iteration`,
  );
  console.log(
    `  so: traces ${((perRow / perIteration) * 100).toFixed(2)}% of run time; a checkpoint every 500 iterations ${((times[20] / (500 * base.chains * perIteration / 1000)) * 100).toFixed(2)}%, every 50 ${((times[20] / (50 * base.chains * perIteration / 1000)) * 100).toFixed(1)}%, every 10 s ${((times[20] / 10000) * 100).toFixed(3)}%`,
  );
}

/** Cores two busy-looping worker threads obtain for `seconds`: the ceiling of any speed-up right now. */
async function coresAvailable(seconds = 1): Promise<number> {
  const code = `const { parentPort } = require('node:worker_threads'); let s = 0; const t = Date.now(); while (Date.now() - t < ${seconds * 1000}) { for (let i = 0; i < 1e5; i++) s += Math.sqrt(i); } parentPort.postMessage(s);`;
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  await Promise.all([0, 1].map(() => new Promise((done) => new Worker(code, { eval: true }).on('message', done))));
  const c = process.cpuUsage(c0);
  return (c.user + c.system) / 1e6 / ((performance.now() - t0) / 1000);
}

const load = () => loadavg().map((x) => x.toFixed(2)).join(', ');
console.log(`load average before: ${load()}; two busy-looping threads obtain ${(await coresAvailable()).toFixed(2)} cores (2 on an idle machine)`);
if (!process.argv.includes('--overhead-only')) await speedUp('fused JS (n = 2000)', { module, exportName: 'fusedSinusoid', args: { n: 2000 } }, { warmup: quick ? 400 : 1000, draws: quick ? 400 : 3000 });
if (!process.argv.includes('--overhead-only')) await speedUp('TensorFlow.js likelihood (n = 1000)', { module, exportName: 'tensorSinusoid', args: { n: 1000 } }, { warmup: quick ? 100 : 200, draws: quick ? 100 : 400 });
await overhead();
console.log(`load average after: ${load()}; two busy-looping threads obtain ${(await coresAvailable()).toFixed(2)} cores`);
rmSync(root, { recursive: true, force: true });

/**
 * Memory of long runs: resident memory and heap must not grow per draw beyond the trace
 * a run keeps (8 bytes per stored value).
 *
 * 1. Streaming: one chain driven by `advanceChain` with each draw handed on and not kept
 *    (what a runner writing to disk does). Growth per draw should be 0.
 * 2. In memory: `runChains`, which keeps the trace (dim values per draw, plus the seven
 *    statistics columns: 41 bytes per draw). Its buffers are allocated up front and
 *    their pages touched as draws arrive, so resident memory grows by about the trace's
 *    bytes per draw and nothing else.
 * Resident memory (process.memoryUsage().rss) and, with --expose-gc, heap plus array
 * buffers after a full collection are sampled through the sampling phase; the growth is
 * the least-squares slope over the second half (after the compiler has settled).
 *
 * Run: node --expose-gc --conditions=source --import tsx bench/suite-memory.ts [--quick]
 */
import { advanceChain, createChainState, resolveChainSettings, runChains } from '@apsis/core';
import { runIfMain, type Figure, type SuiteOptions, type SuiteResult } from './support/figures.js';
import { autoregressiveGaussian } from './support/gaussianTargets.js';

const gc = (globalThis as { gc?: () => void }).gc;

interface Sample {
  readonly draws: number;
  readonly rss: number;
  /** heapUsed + arrayBuffers after a full collection, or NaN without --expose-gc. */
  readonly heap: number;
}

function sample(draws: number): Sample {
  let heap = NaN;
  if (gc) {
    // Twice: one full collection can leave garbage that a weak reference kept alive.
    gc();
    gc();
    const m = process.memoryUsage();
    heap = m.heapUsed + m.arrayBuffers;
  }
  return { draws, rss: process.memoryUsage().rss, heap };
}

/** Least-squares slope of y against x over the second half of the samples. */
function slope(samples: readonly Sample[], y: (s: Sample) => number): number {
  const s = samples.slice(Math.floor(samples.length / 2));
  const mx = s.reduce((a, b) => a + b.draws, 0) / s.length;
  const my = s.reduce((a, b) => a + y(b), 0) / s.length;
  let sxy = 0;
  let sxx = 0;
  for (const p of s) {
    sxy += (p.draws - mx) * (y(p) - my);
    sxx += (p.draws - mx) ** 2;
  }
  return sxy / sxx;
}

/** Runs the memory suite. */
export async function run(options: SuiteOptions): Promise<SuiteResult> {
  const start = performance.now();
  const dim = 50;
  const target = autoregressiveGaussian(dim, 0.5).target;
  const draws = options.quick ? 30000 : 120000;
  const every = draws / (options.quick ? 16 : 40);

  // 1. Streaming.
  const settings = resolveChainSettings({ warmup: 300, draws });
  const state = createChainState(target, settings, 0, 11);
  for (let t = 0; t < settings.warmup; t++) advanceChain(target, settings, state);
  const streamed: Sample[] = [];
  let peakStreamed = 0;
  let sink = 0;
  for (let k = 0; k < draws; k++) {
    sink += advanceChain(target, settings, state).draw[0];
    if (k % every === 0) {
      const s = sample(k);
      streamed.push(s);
      peakStreamed = Math.max(peakStreamed, s.rss);
    }
  }
  if (!Number.isFinite(sink)) throw new Error('non-finite draw');

  // 2. In memory, through runChains.
  const kept: Sample[] = [];
  let peakKept = 0;
  const warmup = 300;
  await runChains(target, {
    chains: 1,
    warmup,
    draws,
    seed: 12,
    onProgress: (p) => {
      if (p.iteration <= warmup || p.iteration - warmup < (kept.length * draws) / (options.quick ? 16 : 40)) return;
      const s = sample(p.iteration - warmup);
      kept.push(s);
      peakKept = Math.max(peakKept, s.rss);
    },
  });
  const traceBytes = dim * 8 + 41;

  const figures: Figure[] = [];
  const group = `memory of long runs (${dim}-D Gaussian, ${draws} draws)`;
  const rssStream = slope(streamed, (s) => s.rss);
  const rssKept = slope(kept, (s) => s.rss);
  if (gc) {
    const heapStream = slope(streamed, (s) => s.heap);
    const heapKept = slope(kept, (s) => s.heap);
    figures.push({
      group,
      name: 'streaming chain: heap + buffers after GC, growth per draw',
      value: heapStream,
      unit: 'B/draw',
      digits: 2,
      target: { op: '<', limit: 8 },
      note: `from ${streamed.length} samples; resident growth ${rssStream.toFixed(1)} B/draw; peak RSS ${(peakStreamed / 2 ** 20).toFixed(0)} MiB`,
    });
    figures.push({
      group,
      name: 'runChains (keeps the trace): heap + buffers after GC, growth per draw',
      value: heapKept,
      unit: 'B/draw',
      digits: 2,
      target: { op: '<', limit: 8 },
      note: `the trace (${traceBytes} B/draw) is allocated at the start, so it does not count here`,
    });
  }
  figures.push({
    group,
    name: 'runChains: resident growth per draw beyond the trace',
    value: rssKept - traceBytes,
    unit: 'B/draw',
    digits: 2,
    note: `resident memory is noisy (the collector grows and shrinks its spaces); resident growth ${rssKept.toFixed(1)} B/draw against ${traceBytes} B/draw of trace (${dim} × 8 + 41 of statistics); peak RSS ${(peakKept / 2 ** 20).toFixed(0)} MiB${gc ? '' : '; run with --expose-gc for heap figures'}`,
  });
  return { suite: 'memory', figures, details: [], seconds: (performance.now() - start) / 1000 };
}

await runIfMain(import.meta.url, run);

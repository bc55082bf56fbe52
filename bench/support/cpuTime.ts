import { median } from './median.js';

/**
 * Process CPU time (user + system), in seconds. On a shared machine other processes
 * inflate wall time but not this process's CPU time; for single-threaded work the two
 * agree on an idle machine.
 */
export function cpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/** Wall-clock seconds since an arbitrary origin (performance.now). */
export function wallSeconds(): number {
  return performance.now() / 1000;
}

/**
 * Seconds per call of `run` (which performs `calls` operations), CPU time, the fastest
 * of `rounds` rounds after one warm-up round.
 */
export function fastestPerCall(run: () => void, calls: number, rounds: number): number {
  run();
  let best = Infinity;
  for (let r = 0; r < rounds; r++) {
    const t0 = cpuSeconds();
    run();
    best = Math.min(best, (cpuSeconds() - t0) / calls);
  }
  return best;
}

/**
 * How many calls of `f` take about `seconds` of CPU time (at least 1), measured on a
 * short trial; used to size timing rounds so that the clock's granularity (about
 * 1 µs for process.cpuUsage, but scheduler ticks of 1–10 ms matter) is negligible.
 */
export function callsForSeconds(f: () => void, seconds: number): number {
  let n = 1;
  for (;;) {
    const t0 = cpuSeconds();
    for (let k = 0; k < n; k++) f();
    const dt = cpuSeconds() - t0;
    if (dt > 0.02 || n > 1e8) return Math.max(1, Math.ceil((n * seconds) / Math.max(dt, 1e-9)));
    n *= 4;
  }
}

/**
 * Seconds per call of each of `fns` (each called as fn(k) with a running counter k),
 * measured in interleaved rounds so that a burst of load from other processes hits all
 * alike; the fastest round of each is kept. Each function first runs for `warmup`
 * seconds (so that the optimising compiler has finished with it: process CPU time also
 * counts the compiler's background threads), then the calls per round are set so that
 * a round of the slowest function lasts about `round` seconds.
 */
export function interleavedBest(
  fns: readonly ((k: number) => void)[],
  options: { warmup?: number; round?: number; rounds?: number } = {},
): number[] {
  const warmup = options.warmup ?? 0.3;
  const round = options.round ?? 0.05;
  const rounds = options.rounds ?? 7;
  let slowest = 0;
  for (const fn of fns) {
    const t0 = cpuSeconds();
    let k = 0;
    while (cpuSeconds() - t0 < warmup) fn(k++);
    // Calls per second after warm-up, from a short second pass.
    const t1 = cpuSeconds();
    let calls = 0;
    while (cpuSeconds() - t1 < 0.25 * warmup) fn(calls++);
    slowest = Math.max(slowest, (cpuSeconds() - t1) / calls);
  }
  const reps = Math.max(1, Math.round(round / slowest));
  const best = fns.map(() => Infinity);
  for (let r = 0; r < rounds; r++) {
    for (let f = 0; f < fns.length; f++) {
      const i = (f + r) % fns.length;
      const fn = fns[i];
      const t0 = cpuSeconds();
      for (let k = 0; k < reps; k++) fn(k);
      best[i] = Math.min(best[i], (cpuSeconds() - t0) / reps);
    }
  }
  return best;
}

/** What {@link pairedBlocks} measured. */
export interface PairedTimes {
  /** Median seconds per call of each function. */
  readonly median: number[];
  /** Median over blocks of (seconds per call of fns[i]) / (seconds per call of fns[0]). */
  readonly ratioToFirst: number[];
  readonly blocks: number;
}

/**
 * Seconds per call of each of `fns`, robust to load that comes and goes: many short
 * blocks, in each of which every function runs `reps` calls back to back (order
 * rotating), timed by the wall clock; the per-block ratios to the first function are
 * taken within a block (a few milliseconds apart, so a change of load hits both) and
 * their median is reported, as are the median times. Each function first runs for
 * `warmup` seconds; `reps` is set so that a block of the first function lasts about
 * `blockSeconds`.
 */
export function pairedBlocks(
  fns: readonly ((k: number) => void)[],
  options: { warmup?: number; blockSeconds?: number; blocks?: number } = {},
): PairedTimes {
  const warmup = options.warmup ?? 0.3;
  const blockSeconds = options.blockSeconds ?? 0.005;
  const blocks = options.blocks ?? 100;
  for (const fn of fns) {
    const t0 = wallSeconds();
    let k = 0;
    while (wallSeconds() - t0 < warmup) fn(k++);
  }
  const t1 = wallSeconds();
  let calls = 0;
  while (wallSeconds() - t1 < 0.05) fns[0](calls++);
  const reps = Math.max(1, Math.round((blockSeconds * calls) / (wallSeconds() - t1)));
  const times = fns.map(() => new Float64Array(blocks));
  for (let b = 0; b < blocks; b++) {
    for (let f = 0; f < fns.length; f++) {
      const i = (f + b) % fns.length;
      const fn = fns[i];
      const t0 = wallSeconds();
      for (let k = 0; k < reps; k++) fn(k);
      times[i][b] = (wallSeconds() - t0) / reps;
    }
  }
  return {
    median: times.map(median),
    ratioToFirst: times.map((t) => median(t.map((x, b) => x / times[0][b]))),
    blocks,
  };
}

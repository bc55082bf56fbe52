import type { ChainProgress } from '../sampler/runOptions.js';

/** One chain's line of progress. */
export interface ChainProgressLine {
  readonly chain: number;
  readonly phase: 'warmup' | 'sampling' | 'done';
  /** Iterations completed, warmup included. */
  readonly iteration: number;
  /** Iterations planned: warmup + draws (for a run until converged: up to the draw cap). */
  readonly total: number;
  /** Divergent transitions so far (warmup and sampling). */
  readonly divergences: number;
  /** Current step size, in the target's unconstrained coordinates. */
  readonly stepSize: number;
  /** Estimated seconds until this chain reaches `total`; null until there is a rate. */
  readonly secondsLeft: number | null;
}

/**
 * What progress callbacks receive: the chain that just reported (the fields of the
 * sampler's `ChainProgress`) plus every chain's line and whole-run figures.
 */
export interface RunProgress extends ChainProgress {
  readonly chains: readonly ChainProgressLine[];
  /** Seconds since this session started. */
  readonly elapsed: number;
  /** Estimated seconds until every chain reaches its `total`; null while unknown. */
  readonly secondsLeft: number | null;
  /** True for a run until converged (`total` is then the draw cap). */
  readonly untilConverged: boolean;
  /** Worker threads (0: the calling thread). */
  readonly threads: number;
  /** The latest convergence check, in words (null before the first). */
  readonly status: string | null;
}

/** Seconds of history used for the rate behind the time-left estimates. */
const rateWindow = 30;

interface Sample {
  readonly t: number;
  readonly iteration: number;
}

/** Keeps every chain's progress and estimates the time left from recent rates. */
export interface ProgressTracker {
  update(event: { chain: number; iteration: number; divergences: number; stepSize: number }): RunProgress;
  /** Records the outcome of a convergence check for the status line. */
  setStatus(status: string): void;
  current(): RunProgress;
}

/** A tracker for `chains` chains starting at `start[c]` iterations. */
export function createProgressTracker(options: {
  chains: number;
  warmup: number;
  total: number;
  start: readonly number[];
  threads: number;
  untilConverged: boolean;
  now?: () => number;
}): ProgressTracker {
  const now = options.now ?? (() => performance.now() / 1000);
  const t0 = now();
  const { warmup, total } = options;
  const samples: Sample[][] = options.start.map((iteration) => [{ t: t0, iteration }]);
  const lines = options.start.map((iteration, chain) => ({ chain, iteration, divergences: 0, stepSize: NaN }));
  let last = 0;
  let status: string | null = null;
  const phaseOf = (i: number): 'warmup' | 'sampling' | 'done' => (i < warmup ? 'warmup' : i < total ? 'sampling' : 'done');
  const secondsLeft = (c: number): number | null => {
    const s = samples[c];
    const a = s[0];
    const b = s[s.length - 1];
    if (b.iteration >= total) return 0;
    if (b.t - a.t <= 0 || b.iteration <= a.iteration) return null;
    return ((total - b.iteration) * (b.t - a.t)) / (b.iteration - a.iteration);
  };
  const current = (): RunProgress => {
    const chains: ChainProgressLine[] = lines.map((l) => ({
      chain: l.chain,
      phase: phaseOf(l.iteration),
      iteration: l.iteration,
      total,
      divergences: l.divergences,
      stepSize: l.stepSize,
      secondsLeft: secondsLeft(l.chain),
    }));
    const lefts = chains.map((c) => c.secondsLeft);
    const l = lines[last];
    return {
      chain: last,
      phase: l.iteration < warmup ? 'warmup' : 'sampling',
      iteration: l.iteration,
      total,
      divergences: l.divergences,
      stepSize: l.stepSize,
      chains,
      elapsed: now() - t0,
      secondsLeft: lefts.some((x) => x === null) ? null : Math.max(0, ...(lefts as number[])),
      untilConverged: options.untilConverged,
      threads: options.threads,
      status,
    };
  };
  return {
    update(event) {
      const t = now();
      const s = samples[event.chain];
      s.push({ t, iteration: event.iteration });
      while (s.length > 2 && t - s[1].t > rateWindow) s.shift();
      lines[event.chain] = { chain: event.chain, iteration: event.iteration, divergences: event.divergences, stepSize: event.stepSize };
      last = event.chain;
      return current();
    },
    setStatus(text) {
      status = text;
    },
    current,
  };
}

/**
 * When, during warmup, the metric is estimated. Iterations are 0-based indices into
 * warmup. Every warmup iteration adapts the step size; positions drawn inside a slow
 * window are accumulated, and at each window's end the metric is re-estimated from
 * that window alone and dual averaging is re-centred on a new step size.
 */
export interface WarmupSchedule {
  /** Number of warmup iterations. */
  readonly warmup: number;
  /** Iterations [0, initialFast) adapt only the step size. */
  readonly initialFast: number;
  /** Slow windows as [start, end) pairs, contiguous, each at least twice the last. */
  readonly slowWindows: readonly (readonly [number, number])[];
  /** Iterations [warmup − terminalFast, warmup) adapt only the step size. */
  readonly terminalFast: number;
}

/** Warmups shorter than this estimate no metric: no window could beat the identity. */
export const minimumWarmupForMetric = 20;

/**
 * The window layout for a warmup of `warmup` iterations.
 *
 * For warmup ≥ 1000: an initial fast interval of 75 iterations, a first slow window of
 * 25 that doubles (25, 50, 100, …), and a terminal fast interval of 50; the last slow
 * window is stretched to the terminal interval whenever the next doubled window would
 * not fit. For 20 ≤ warmup < 1000 all three sizes shrink in proportion to warmup / 1000
 * (rounded; at least 2, 3 and 2 iterations). Below 20, or when the metric is not
 * adapted, the whole warmup adapts only the step size.
 *
 * Why these sizes: the first 75 iterations bring a chain from its random start into
 * the typical set, so their positions would inflate a variance estimate; doubling
 * windows let each estimate use more draws from an ever better adapted sampler, and
 * only the last (largest, usually about half of warmup) window sets the final metric;
 * the terminal 50 iterations let the step size settle for that final metric.
 */
export function warmupSchedule(warmup: number, adaptMetric: boolean): WarmupSchedule {
  if (!Number.isInteger(warmup) || warmup < 0) {
    throw new RangeError(`warmup = ${String(warmup)}: expected an integer >= 0`);
  }
  if (!adaptMetric || warmup < minimumWarmupForMetric) {
    return { warmup, initialFast: warmup, slowWindows: [], terminalFast: 0 };
  }
  const f = Math.min(1, warmup / 1000);
  const initialFast = Math.max(2, Math.round(75 * f));
  const terminalFast = Math.max(2, Math.round(50 * f));
  const base = Math.max(3, Math.round(25 * f));
  const slowEnd = warmup - terminalFast;
  const slowWindows: [number, number][] = [];
  let start = initialFast;
  let size = base;
  while (start < slowEnd) {
    let end = start + size;
    // Stretch this window to the end if the next, doubled one would not fit after it.
    if (end + 2 * size > slowEnd) end = slowEnd;
    slowWindows.push([start, end]);
    start = end;
    size *= 2;
  }
  return { warmup, initialFast, slowWindows, terminalFast };
}

/** Index of the slow window containing warmup iteration `iteration`, or −1. */
export function slowWindowIndex(schedule: WarmupSchedule, iteration: number): number {
  const w = schedule.slowWindows;
  for (let k = 0; k < w.length; k++) {
    if (iteration >= w[k][0] && iteration < w[k][1]) return k;
  }
  return -1;
}

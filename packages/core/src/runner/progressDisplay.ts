import type { RunProgress } from './progressTracker.js';

/** A stream progress can be drawn on (process.stderr, or a test double). */
export interface ProgressStream {
  write(text: string): unknown;
  readonly isTTY?: boolean;
  readonly columns?: number;
}

/** Draws run progress on a terminal, redrawing its lines in place. */
export interface ProgressDisplay {
  /** Shows `progress` (at most every `interval` seconds unless `force`). */
  update(progress: RunProgress, force?: boolean): void;
  /** Leaves the last drawing on screen and moves below it. */
  finish(): void;
}

/**
 * True when progress should be drawn on `stream`: it is a terminal and the `CI`
 * environment variable is unset, empty, `0` or `false`.
 */
export function progressWanted(stream: ProgressStream, env: NodeJS.ProcessEnv = process.env): boolean {
  const ci = env.CI;
  const inCi = ci !== undefined && ci !== '' && ci !== '0' && ci.toLowerCase() !== 'false';
  return stream.isTTY === true && !inCi;
}

/** Seconds as `m:ss` or `h:mm:ss`. */
export function formatDuration(seconds: number): string {
  const s = Math.max(0, Math.round(seconds));
  const h = Math.floor(s / 3600);
  const m = Math.floor((s % 3600) / 60);
  const ss = String(s % 60).padStart(2, '0');
  return h > 0 ? `${h}:${String(m).padStart(2, '0')}:${ss}` : `${m}:${ss}`;
}

function bar(fraction: number, width: number): string {
  const filled = Math.max(0, Math.min(width, Math.round(fraction * width)));
  return '#'.repeat(filled) + '.'.repeat(width - filled);
}

function stepText(x: number): string {
  return Number.isFinite(x) ? x.toPrecision(3) : '-';
}

/** The lines of a progress drawing (no trailing newlines). */
export function progressLines(p: RunProgress): string[] {
  const left = p.secondsLeft === null ? 'estimating time left' : `about ${formatDuration(p.secondsLeft)} left${p.untilConverged ? ' at most (draw cap)' : ''}`;
  const where = p.threads === 0 ? 'in this thread' : `on ${p.threads} worker thread${p.threads > 1 ? 's' : ''}`;
  const head = `${p.chains.length} chain${p.chains.length > 1 ? 's' : ''} ${where} | ${formatDuration(p.elapsed)} elapsed | ${left}`;
  const width = String(p.total).length;
  const lines = [head];
  for (const c of p.chains) {
    const done = `${String(c.iteration).padStart(width)}/${c.total}`;
    const eta = c.secondsLeft === null ? '' : c.phase === 'done' ? '' : `  ${formatDuration(c.secondsLeft)} left`;
    lines.push(
      `  chain ${c.chain}  ${c.phase.padEnd(8)}  ${done}  [${bar(c.iteration / c.total, 20)}]  divergent ${c.divergences}  step ${stepText(c.stepSize)}${eta}`,
    );
  }
  if (p.status !== null) lines.push(`  ${p.status}`);
  return lines;
}

/**
 * A display on `stream`. On a terminal the drawing is redrawn in place (cursor up,
 * clear line); elsewhere each update would be appended, so use
 * {@link progressWanted} to decide whether to draw at all.
 */
export function createProgressDisplay(stream: ProgressStream, interval = 0.1): ProgressDisplay {
  let drawn = 0;
  let lastAt = -Infinity;
  let pending: RunProgress | null = null;
  const draw = (p: RunProgress): void => {
    const cols = stream.columns && stream.columns > 10 ? stream.columns - 1 : 200;
    const lines = progressLines(p).map((l) => (l.length > cols ? l.slice(0, cols) : l));
    let out = drawn > 0 && stream.isTTY ? `\x1b[${drawn}A` : '';
    for (const l of lines) out += `\r\x1b[2K${l}\n`;
    for (let k = lines.length; k < drawn; k++) out += '\r\x1b[2K\n';
    stream.write(out);
    drawn = Math.max(drawn, lines.length);
    pending = null;
  };
  return {
    update(p, force = false) {
      const t = performance.now() / 1000;
      if (!force && t - lastAt < interval) {
        pending = p;
        return;
      }
      lastAt = t;
      draw(p);
    },
    finish() {
      if (pending !== null) draw(pending);
    },
  };
}

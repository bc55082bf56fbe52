import { describe, expect, it, vi } from 'vitest';
import { createProgressDisplay, executeRun, formatDuration, progressLines, progressWanted, type RunProgress } from '../src/runner/index.js';
import { createProgressTracker } from '../src/runner/progressTracker.js';
import { gaussian } from './fixtures/targets.js';

describe('progress', () => {
  it('draws only on a terminal, and never when CI is set (common practice)', () => {
    expect(progressWanted({ write: () => true, isTTY: true }, {})).toBe(true);
    expect(progressWanted({ write: () => true, isTTY: true }, { CI: 'true' })).toBe(false);
    expect(progressWanted({ write: () => true, isTTY: true }, { CI: '1' })).toBe(false);
    expect(progressWanted({ write: () => true, isTTY: true }, { CI: 'false' })).toBe(true);
    expect(progressWanted({ write: () => true, isTTY: false }, {})).toBe(false);
    expect(progressWanted({ write: () => true }, {})).toBe(false);
  });

  it('estimates time left from the recent rate of each chain', () => {
    let t = 0;
    const tracker = createProgressTracker({ chains: 2, warmup: 100, total: 300, start: [0, 0], threads: 2, untilConverged: false, now: () => t });
    t = 10;
    tracker.update({ chain: 0, iteration: 100, divergences: 1, stepSize: 0.5 });
    // 100 iterations in 10 s: 200 left at 10 per second is 20 s (hand-computed).
    let p = tracker.update({ chain: 1, iteration: 50, divergences: 0, stepSize: 0.25 });
    expect(p.chains[0].secondsLeft).toBeCloseTo(20, 12);
    // 50 in 10 s: 250 left at 5 per second is 50 s; the run waits for the slowest chain.
    expect(p.chains[1].secondsLeft).toBeCloseTo(50, 12);
    expect(p.secondsLeft).toBeCloseTo(50, 12);
    expect(p.chains[0].phase).toBe('sampling');
    expect(p.chains[1].phase).toBe('warmup');
    expect(p.chain).toBe(1);
    t = 20;
    p = tracker.update({ chain: 1, iteration: 300, divergences: 2, stepSize: 0.25 });
    expect(p.chains[1].phase).toBe('done');
    expect(p.chains[1].secondsLeft).toBe(0);
    expect(formatDuration(3725)).toBe('1:02:05');
    expect(formatDuration(59.6)).toBe('1:00');
  });

  it('redraws in place on a terminal: cursor up over the lines drawn before', () => {
    const writes: string[] = [];
    const display = createProgressDisplay({ write: (s: string) => writes.push(s), isTTY: true, columns: 120 }, 0);
    let t = 0;
    const tracker = createProgressTracker({ chains: 2, warmup: 10, total: 30, start: [0, 0], threads: 0, untilConverged: false, now: () => t });
    t = 1;
    display.update(tracker.update({ chain: 0, iteration: 12, divergences: 3, stepSize: 0.123456 }), true);
    display.update(tracker.update({ chain: 1, iteration: 5, divergences: 0, stepSize: 0.5 }), true);
    expect(writes).toHaveLength(2);
    expect(writes[0]).not.toMatch(/\x1b\[\d+A/);
    expect(writes[1].startsWith('\x1b[3A')).toBe(true);
    const lines = progressLines(tracker.current());
    expect(lines[0]).toMatch(/^2 chains in this thread \| 0:01 elapsed/);
    expect(lines[1]).toMatch(/chain 0 {2}sampling {2}12\/30 .* divergent 3 {2}step 0\.123/);
    expect(lines[2]).toMatch(/chain 1 {2}warmup/);
  });

  it('calls back with every chain’s line, and shows a display on stderr when asked', async () => {
    const seen: RunProgress[] = [];
    const drawn: string[] = [];
    const spy = vi.spyOn(process.stderr, 'write').mockImplementation((text) => drawn.push(String(text)) > 0);
    try {
      await executeRun(gaussian(null), { chains: 2, warmup: 40, draws: 60, seed: 1, progress: true, onProgress: (p) => seen.push(p) });
    } finally {
      spy.mockRestore();
    }
    expect(seen.length).toBeGreaterThanOrEqual(2);
    const last = seen[seen.length - 1];
    expect(last.chains.map((c) => c.iteration)).toEqual([100, 100]);
    expect(last.total).toBe(100);
    expect(last.chains.every((c) => c.phase === 'done')).toBe(true);
    expect(drawn.join('')).toMatch(/chain 1 {2}done/);
  });
});

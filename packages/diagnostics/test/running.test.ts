import { describe, expect, it } from 'vitest';
import {
  addDraws,
  createRunningDiagnostics,
  essOfMean,
  NonFiniteDrawError,
  OptionError,
  readRunningDiagnostics,
  RunningStateError,
  splitRhat,
  splitRhatBasic,
  splitRhatFolded,
  type RunningDiagnosticsState,
} from '../src/index.js';
import { ar1Chain, chainsOf, createRandom } from './support/random.js';

/** Feeds chains in interleaved chunks of varying size, as a runner streaming draws would. */
function feed(state: RunningDiagnosticsState, chains: Float64Array[], seed: number): void {
  const rng = createRandom(seed);
  const at = chains.map(() => 0);
  while (at.some((a, c) => a < chains[c].length)) {
    for (let c = 0; c < chains.length; c++) {
      const size = 1 + Math.floor(rng.uniform() * 700);
      const end = Math.min(chains[c].length, at[c] + size);
      addDraws(state, c, chains[c].subarray(at[c], end));
      at[c] = end;
    }
  }
}

function byteSize(state: RunningDiagnosticsState): number {
  return Object.values(state).reduce((s, v) => s + (ArrayBuffer.isView(v) ? v.byteLength : 0), 0);
}

/**
 * Tolerances come from a 20-replication pilot at 4 chains x 20000 draws (default options):
 * rank R-hat from the reservoir minus the full splitRhat: |diff| ≤ 0.0015 for AR(1)
 * phi = 0.9; relative to R-hat - 1, sd 8% (max 17%) for one chain shifted by 1 sd and sd 6%
 * (max 12%) for one chain scaled by 3. Batch-means ESS (lagWindow 16, phi = 0.98) relative to
 * the full value: sd 4%, max 12%; for shifted chains -4.6% ± 0.4%.
 */
describe('running diagnostics against the full computation', () => {
  it('ESS from the running lag sums equals essOfMean(chains, { split: false }) when the sequence ends within the window', () => {
    const rng = createRandom(71);
    // far from zero on purpose: the per-chain shift keeps the running sums well conditioned
    const chains = chainsOf(4, () => ar1Chain(rng, 6000, 0.5).map((v) => 1e6 + v));
    const state = createRunningDiagnostics({ chains: 4 });
    feed(state, chains, 72);
    const q = readRunningDiagnostics(state).quantities[0];
    expect(q.essMethod).toBe('autocorrelation');
    expect(Math.abs(q.ess! / essOfMean(chains, { split: false }) - 1)).toBeLessThan(1e-8);
    const pooled = chains.flatMap((c) => Array.from(c));
    const mean = pooled.reduce((s, v) => s + v, 0) / pooled.length;
    expect(Math.abs(q.mean / mean - 1)).toBeLessThan(1e-13);
    expect(q.sd).toBeCloseTo(Math.sqrt(pooled.reduce((s, v) => s + (v - mean) ** 2, 0) / (pooled.length - 1)), 9);
  });

  it('classic split R-hat from the batch ladder equals splitRhatBasic when the split falls on a batch boundary, and is close otherwise', () => {
    const rng = createRandom(73);
    const chains = chainsOf(4, (c) => ar1Chain(rng, 8192, 0.7).map((v) => v + 0.3 * c));
    const state = createRunningDiagnostics({ chains: 4, batches: 64 });
    feed(state, chains, 74);
    // 8192 draws with 64 slots: 32 closed batches of 256, the split (4096) on a boundary
    expect(state.batchSize[0]).toBe(256);
    expect(readRunningDiagnostics(state).quantities[0].rhatBasic).toBeCloseTo(splitRhatBasic(chains), 12);
    const more = chainsOf(4, (c) => ar1Chain(rng, 3001, 0.7).map((v) => v + 0.3 * c));
    more.forEach((m, c) => addDraws(state, c, m));
    const all = chains.map((c, i) => Float64Array.from([...c, ...more[i]]));
    expect(Math.abs(readRunningDiagnostics(state).quantities[0].rhatBasic! - splitRhatBasic(all))).toBeLessThan(1e-3);
  });

  it('AR(1) chains that agree: rank R-hat within 0.005 of splitRhat, ESS exact', () => {
    const rng = createRandom(75);
    const chains = chainsOf(4, () => ar1Chain(rng, 20000, 0.9));
    const state = createRunningDiagnostics({ chains: 4 });
    feed(state, chains, 76);
    const q = readRunningDiagnostics(state).quantities[0];
    expect(Math.abs(q.rhat! - splitRhat(chains))).toBeLessThan(0.005);
    expect(q.essMethod).toBe('autocorrelation');
    expect(Math.abs(q.ess! / essOfMean(chains, { split: false }) - 1)).toBeLessThan(1e-8);
  });

  it('separated chains (one shifted by 1 sd): R-hat within 30% of its excess over 1, ESS within 15%', () => {
    const rng = createRandom(77);
    const chains = chainsOf(4, (c) => ar1Chain(rng, 20000, 0.5).map((v) => v + (c === 0 ? 1 : 0)));
    const state = createRunningDiagnostics({ chains: 4 });
    feed(state, chains, 78);
    const q = readRunningDiagnostics(state).quantities[0];
    const full = splitRhat(chains);
    expect(full).toBeGreaterThan(1.05);
    expect(Math.abs(q.rhat! - full) / (full - 1)).toBeLessThan(0.3);
    const fullEss = essOfMean(chains, { split: false });
    expect(Math.abs(q.ess! / fullEss - 1)).toBeLessThan(0.15);
    expect(q.ess!).toBeLessThan(400);
  });

  it('one chain with three times the scale: the running folded R-hat catches it like the full one', () => {
    const rng = createRandom(79);
    const chains = chainsOf(4, (c) => ar1Chain(rng, 20000, 0.5).map((v) => (c === 0 ? 3 * v : v)));
    const state = createRunningDiagnostics({ chains: 4 });
    feed(state, chains, 80);
    const q = readRunningDiagnostics(state).quantities[0];
    const full = splitRhatFolded(chains);
    expect(full).toBeGreaterThan(1.05);
    expect(q.rhatFolded!).toBeGreaterThan(1.05);
    expect(Math.abs(q.rhat! - splitRhat(chains)) / (full - 1)).toBeLessThan(0.3);
  });

  it('slow mixing beyond the lag window falls back to batch means, within 30% of the full ESS', () => {
    const rng = createRandom(81);
    const chains = chainsOf(4, () => ar1Chain(rng, 20000, 0.98));
    const state = createRunningDiagnostics({ chains: 4, lagWindow: 16 });
    feed(state, chains, 82);
    const q = readRunningDiagnostics(state).quantities[0];
    expect(q.essMethod).toBe('batch-means');
    expect(Math.abs(q.ess! / essOfMean(chains, { split: false }) - 1)).toBeLessThan(0.3);
  });
});

describe('running diagnostics: bounded state, checkpoints, edge cases', () => {
  it('memory does not grow with the number of draws', () => {
    const rng = createRandom(83);
    const state = createRunningDiagnostics({ chains: 2, dim: 3, lagWindow: 32, batches: 16, reservoir: 64 });
    const before = byteSize(state);
    for (let i = 0; i < 200; i++) for (let c = 0; c < 2; c++) addDraws(state, c, ar1Chain(rng, 3 * 250, 0.3));
    expect(byteSize(state)).toBe(before);
    expect(Array.from(state.count)).toEqual([50000, 50000]);
    expect(state.reservoirCount[0]).toBeLessThanOrEqual(64);
    expect(state.closedBatches[0]).toBeLessThanOrEqual(16);
    const snap = readRunningDiagnostics(state);
    expect(snap.quantities.map((q) => q.name)).toEqual(['x[0]', 'x[1]', 'x[2]']);
  });

  it('a copied state (a checkpoint) continues exactly like the original', () => {
    const rng = createRandom(84);
    const state = createRunningDiagnostics({ chains: 2 });
    for (let c = 0; c < 2; c++) addDraws(state, c, ar1Chain(rng, 5000, 0.6));
    const copy = structuredClone(state);
    const next = chainsOf(2, () => ar1Chain(rng, 3000, 0.6));
    next.forEach((n, c) => {
      addDraws(state, c, n);
      addDraws(copy, c, n);
    });
    expect(readRunningDiagnostics(copy)).toEqual(readRunningDiagnostics(state));
  });

  it('values are null before 8 draws per chain; unequal progress gives a notice', () => {
    const state = createRunningDiagnostics({ chains: 2 });
    addDraws(state, 0, [1, 2, 3, 4, 5, 6, 7, 8, 9]);
    addDraws(state, 1, [1, 2, 3]);
    const snap = readRunningDiagnostics(state);
    expect(snap.quantities[0]).toMatchObject({ rhat: null, ess: null, rhatBasic: null });
    expect(snap.notices[0].code).toBe('chains-truncated');
    expect(snap.drawsPerChain).toEqual([9, 3]);
  });

  it('constant draws give null R-hat and ESS, never NaN', () => {
    const state = createRunningDiagnostics({ chains: 2 });
    for (let c = 0; c < 2; c++) addDraws(state, c, new Float64Array(100).fill(4));
    const q = readRunningDiagnostics(state).quantities[0];
    expect(q).toMatchObject({ rhat: null, ess: null, rhatBasic: null, mean: 4, sd: 0, median: 4 });
  });

  it('rejects bad options, chain indices, row lengths and non-finite draws, naming the field', () => {
    expect(() => createRunningDiagnostics({ chains: 0 })).toThrow(OptionError);
    expect(() => createRunningDiagnostics({ chains: 2, batches: 15 })).toThrow(/options\.batches: expected an even number, got 15/);
    expect(() => createRunningDiagnostics({ chains: 2, dim: 2, names: ['a'] })).toThrow(/options\.names: expected 2 names/);
    const state = createRunningDiagnostics({ chains: 2, dim: 2 });
    expect(() => addDraws(state, 2, [1, 2])).toThrow(RunningStateError);
    expect(() => addDraws(state, 2, [1, 2])).toThrow(/chain: expected an integer from 0 to 1, got 2/);
    expect(() => addDraws(state, 0, [1, 2, 3])).toThrow(/draws: expected a row-major array whose length is a multiple of dim = 2, got length 3/);
    expect(() => addDraws(state, 1, [1, 2, 3, Number.NaN])).toThrow(NonFiniteDrawError);
    expect(() => addDraws(state, 1, [1, 2, 3, Number.NaN])).toThrow(/draws\[1\]\[1\]: expected a finite number, got NaN/);
  });
});

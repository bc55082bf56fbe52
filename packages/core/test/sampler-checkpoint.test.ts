import { describe, expect, it } from 'vitest';
import {
  advanceChain,
  chainPhase,
  ChainStateError,
  createChainState,
  resolveChainSettings,
  restoreChainState,
  runChains,
  serialiseChainState,
  type ChainSettings,
  type ChainSettingsInput,
  type ChainState,
} from '../src/sampler/index.js';
import type { Target } from '../src/target.js';
import { correlatedPair, standardNormal } from './support/targets.js';

function runFrom(target: Target, settings: ChainSettings, state: ChainState, n: number): Float64Array[] {
  const out: Float64Array[] = [];
  for (let k = 0; k < n; k++) {
    const step = advanceChain(target, settings, state);
    out.push(step.draw);
    out.push(Float64Array.of(step.stats.stepSize, step.stats.energy, step.stats.acceptance));
  }
  return out;
}

function roundTrip(state: ChainState): ChainState {
  return restoreChainState(JSON.parse(JSON.stringify(serialiseChainState(state))));
}

describe('determinism', () => {
  it('same seed and options give identical draws and statistics; different seeds differ', async () => {
    const { target } = correlatedPair(0.9);
    const options = { chains: 2, warmup: 150, draws: 100 } as const;
    const a = await runChains(target, { ...options, seed: 11 });
    const b = await runChains(target, { ...options, seed: 11 });
    const c = await runChains(target, { ...options, seed: 12 });
    expect(b.draws).toEqual(a.draws);
    expect(b.stats).toEqual(a.stats);
    expect(b.adaptation).toEqual(a.adaptation);
    expect(c.draws[0]).not.toEqual(a.draws[0]);
    expect(a.draws[1]).not.toEqual(a.draws[0]);
  });

  it('an unseeded run reports the seed that reproduces it', async () => {
    const target = standardNormal(2);
    const a = await runChains(target, { chains: 1, warmup: 30, draws: 20 });
    expect(Number.isSafeInteger(a.seed)).toBe(true);
    const b = await runChains(target, { chains: 1, warmup: 30, draws: 20, seed: a.seed });
    expect(b.draws).toEqual(a.draws);
  });

  it('runChains equals driving the chains by hand with advanceChain', async () => {
    const { target } = correlatedPair(0.5);
    const input: ChainSettingsInput = { warmup: 60, draws: 40 };
    const r = await runChains(target, { ...input, chains: 2, seed: 9 });
    const settings = resolveChainSettings(input);
    for (let c = 0; c < 2; c++) {
      const state = createChainState(target, settings, c, 9);
      const draws: number[] = [];
      while (chainPhase(settings, state) !== 'done') {
        const step = advanceChain(target, settings, state);
        if (step.phase === 'sampling') draws.push(...step.draw);
      }
      expect(Float64Array.from(draws)).toEqual(r.draws[c]);
    }
  });
});

describe('checkpoint and restore', () => {
  const cases: [string, ChainSettingsInput][] = [
    ['NUTS, diagonal', { warmup: 200, draws: 100 }],
    ['NUTS, dense', { warmup: 200, draws: 100, metric: 'dense' }],
    ['NUTS, unit', { warmup: 200, draws: 100, metric: 'unit' }],
    ['static HMC with jitter', { warmup: 200, draws: 100, method: 'hmc', steps: 7, jitter: 0.2 }],
  ];
  it.each(cases)('%s: restore + continue is bit-identical mid-warmup and mid-sampling', (_, input) => {
    const { target } = correlatedPair(0.95);
    const settings = resolveChainSettings(input);
    const reference = runFrom(target, settings, createChainState(target, settings, 1, 2024), 300);
    // Stop inside a slow window (windows for warmup 200: [15,20) [20,30) [30,50) [50,90)
    // [90,190)), right after a window end, and in sampling.
    expect(settings.schedule.slowWindows.length === 0 || settings.schedule.slowWindows[3][1] === 90).toBe(true);
    for (const stop of [70, 90, 250]) {
      const first = createChainState(target, settings, 1, 2024);
      const head = runFrom(target, settings, first, stop);
      if (stop === 70 && first.welford !== null) expect(first.welford.count).toBe(20);
      const resumed = roundTrip(first);
      const tail = runFrom(target, settings, resumed, 300 - stop);
      expect([...head, ...tail]).toEqual(reference);
    }
  });

  it('serialised state is plain JSON and restores to an equal state', () => {
    const { target } = correlatedPair(0.3);
    const settings = resolveChainSettings({ warmup: 100, draws: 10, metric: 'dense' });
    const state = createChainState(target, settings, 0, 1);
    runFrom(target, settings, state, 80);
    const data = serialiseChainState(state);
    const text = JSON.stringify(data);
    expect(JSON.parse(text)).toEqual(data);
    const back = serialiseChainState(restoreChainState(JSON.parse(text)));
    expect(back).toEqual(data);
  });

  it('restores a version-1 state (written before re-centred dual averaging) with no prior updates', () => {
    const target = standardNormal(2);
    const settings = resolveChainSettings({ warmup: 100, draws: 10 });
    const state = createChainState(target, settings, 0, 1);
    runFrom(target, settings, state, 30);
    const data = serialiseChainState(state);
    const { priorUpdates: _dropped, ...v1DualAveraging } = data.dualAveraging;
    const restored = restoreChainState({ ...data, version: 1, dualAveraging: v1DualAveraging });
    expect(restored.dualAveraging).toEqual({ ...v1DualAveraging, priorUpdates: 0 });
  });

  it('rejects inconsistent checkpoints naming the field', () => {
    const target = standardNormal(2);
    const settings = resolveChainSettings({ warmup: 10, draws: 10 });
    const data = serialiseChainState(createChainState(target, settings, 0, 1));
    expect(() => restoreChainState({ ...data, position: [1] })).toThrow(/field `position` has length 1: expected 2/);
    expect(() => restoreChainState({ ...data, format: 'other' })).toThrow(ChainStateError);
    expect(() => restoreChainState({ ...data, stepSize: -1 })).toThrow(/field `stepSize`/);
    expect(() => restoreChainState({ ...data, rng: { generator: 'xor4096' } })).toThrow(/field `rng`/);
    const { priorUpdates: _dropped, ...withoutPriorUpdates } = data.dualAveraging;
    expect(() => restoreChainState({ ...data, dualAveraging: withoutPriorUpdates })).toThrow(
      /field `dualAveraging.priorUpdates`: required in version 2/,
    );
    const state = restoreChainState(data);
    expect(() => advanceChain(standardNormal(3), settings, state)).toThrow(/target.dim = 3 but the chain state has dim 2/);
    for (let k = 0; k < 20; k++) advanceChain(target, settings, state);
    expect(() => advanceChain(target, settings, state)).toThrow(/the chain is done/);
  });
});

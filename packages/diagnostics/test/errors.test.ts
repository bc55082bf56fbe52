import { describe, expect, it } from 'vitest';
import {
  bulkEss,
  ChainShapeError,
  DiagnosticsError,
  essOfQuantile,
  mcseOfQuantile,
  NonFiniteDrawError,
  OptionError,
  splitRhat,
  summarize,
  summarizeDraws,
  tailEss,
  TooFewDrawsError,
} from '../src/index.js';
import { chainsOf, createRandom, normalDraws } from './support/random.js';

describe('input validation and edge cases', () => {
  it('refuses fewer than 4 draws per split half, naming the field and the chain', () => {
    const short = [normalDraws(createRandom(1), 10), normalDraws(createRandom(2), 7)];
    expect(() => splitRhat(short)).toThrow(TooFewDrawsError);
    expect(() => bulkEss(short)).toThrow(/^chains: each chain needs at least 8 draws \(4 in each split half\), but chains\[1\] has 7$/);
    expect(() => summarize({ period: short })).toThrow(/quantities\.period: each chain needs at least 8 draws/);
    // 8 draws (4 per half) is enough
    expect(Number.isFinite(splitRhat([normalDraws(createRandom(3), 8), normalDraws(createRandom(4), 8)]))).toBe(true);
  });

  it('reports a non-finite draw with its chain and position', () => {
    const chains = chainsOf(2, () => normalDraws(createRandom(5), 20));
    chains[1][13] = Number.NaN;
    expect(() => tailEss(chains)).toThrow(NonFiniteDrawError);
    expect(() => tailEss(chains)).toThrow('chains[1][13]: expected a finite number, got NaN');
    chains[1][13] = Infinity;
    try {
      summarize({ amplitude: chains });
    } catch (e) {
      expect(e).toBeInstanceOf(NonFiniteDrawError);
      expect((e as NonFiniteDrawError).field).toBe('quantities.amplitude');
      expect((e as NonFiniteDrawError).chain).toBe(1);
      expect((e as NonFiniteDrawError).draw).toBe(13);
      expect((e as Error).message).toBe('quantities.amplitude[1][13]: expected a finite number, got Infinity');
    }
    expect.assertions(7);
  });

  it('refuses inputs that are not arrays of chains, with the field and what was found', () => {
    expect(() => splitRhat([] as number[][])).toThrow(/^chains: expected at least one chain, got an empty array$/);
    expect(() => splitRhat('abc' as unknown as number[][])).toThrow(ChainShapeError);
    expect(() => splitRhat('abc' as unknown as number[][])).toThrow(/chains: expected an array of chains .* got string abc/);
    expect(() => splitRhat([[1, 2, 3, 4, 5, 6, 7, 8], 5] as unknown as number[][])).toThrow(/^chains\[1\]: expected an array or a numeric typed array of draws, got number 5$/);
    expect(() => splitRhat([[1, 2, 3, 4, 5, 6, 7, '8']] as unknown as number[][])).toThrow(/^chains\[0\]\[7\]: expected a finite number, got string 8$/);
    expect(() => splitRhat([[1, 2, 3], 5] as unknown as number[][])).toThrow(DiagnosticsError);
  });

  it('accepts plain arrays and any numeric typed array alike', () => {
    // integer-valued draws, so the float32 copies hold exactly the same values
    const a = normalDraws(createRandom(6), 50).map((v) => Math.round(1000 * v));
    const b = normalDraws(createRandom(7), 50).map((v) => Math.round(1000 * v));
    const reference = splitRhat([a, b]);
    expect(splitRhat([Array.from(a), Array.from(b)])).toBe(reference);
    expect(splitRhat([Float32Array.from(a), Int32Array.from(b)])).toBe(reference);
  });

  it('chains of unequal length are truncated to the shortest', () => {
    const a = normalDraws(createRandom(8), 60);
    const b = normalDraws(createRandom(9), 40);
    expect(splitRhat([a, b])).toBe(splitRhat([a.subarray(0, 40), b]));
  });

  it('validates probabilities and options, naming the option', () => {
    const chains = chainsOf(2, () => normalDraws(createRandom(10), 20));
    expect(() => essOfQuantile(chains, 1.5)).toThrow(OptionError);
    expect(() => mcseOfQuantile(chains, 0)).toThrow(/^probability: expected a probability strictly between 0 and 1, got 0$/);
    expect(() => summarize({ x: chains }, { quantiles: [0.1, 1.2] })).toThrow(/^options\.quantiles\[1\]: expected a probability strictly between 0 and 1, got 1\.2$/);
    expect(() => summarize({ x: chains }, { quantiles: [] })).toThrow(/options\.quantiles: expected a non-empty array/);
    expect(() => summarize({})).toThrow(/expected at least one quantity/);
    expect(() => summarizeDraws([new Float64Array(9)], { dim: 2 })).toThrow(/^draws\[0\]: expected a flat row-major matrix whose length is a multiple of dim = 2, got length 9$/);
    expect(() => summarizeDraws([new Float64Array(20)], { dim: 2, names: ['a'] })).toThrow(/options\.names: expected 2 names/);
  });
});

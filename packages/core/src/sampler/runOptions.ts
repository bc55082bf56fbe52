import { z } from 'zod';
import {
  chainSettingsExpected,
  chainSettingsShape,
  settingsFromParsed,
  type ChainSettings,
  type ChainSettingsInput,
} from './chainSettings.js';
import { parseOptions } from './optionErrors.js';

/** What `onProgress` receives, at most every 50 iterations of each chain and at its end. */
export interface ChainProgress {
  /** Chain index, 0-based. */
  readonly chain: number;
  /** Phase of the last iteration run. */
  readonly phase: 'warmup' | 'sampling';
  /** Iterations completed by this chain, warmup included. */
  readonly iteration: number;
  /** warmup + draws. */
  readonly total: number;
  /** Divergent transitions of this chain so far (warmup and sampling). */
  readonly divergences: number;
  /** Current step size. */
  readonly stepSize: number;
}

/** Options of `runChains`; every field is optional. */
export interface RunOptions extends ChainSettingsInput {
  /** Number of chains (default 4). */
  chains?: number;
  /** Run seed, a safe integer ≥ 0; one is drawn and reported in the result when absent. */
  seed?: number;
  /** Starting positions, one per chain, each of length `target.dim`. */
  init?: readonly (Float64Array | readonly number[])[];
  /** Called with each chain's progress. */
  onProgress?: (progress: ChainProgress) => void;
  /** Also return the warmup iterations' draws and statistics. */
  keepWarmup?: boolean;
  /** Aborts the run between iterations; `runChains` then rejects with the signal's reason. */
  signal?: AbortSignal;
}

/** Descriptions of valid values of every option, for error messages. */
export const runOptionsExpected: Readonly<Record<keyof RunOptions, string>> = {
  chains: 'an integer from 1 to 1024',
  seed: 'a safe integer >= 0',
  init: 'an array with one position (Float64Array or array of finite numbers) per chain',
  onProgress: 'a function',
  keepWarmup: 'true or false',
  signal: 'an AbortSignal',
  ...chainSettingsExpected,
};

const runOptionsSchema = z.strictObject({
  ...chainSettingsShape,
  chains: z.number().int().min(1).max(1024).optional(),
  seed: z.number().int().min(0).refine(Number.isSafeInteger).optional(),
  init: z
    .array(z.union([z.instanceof(Float64Array), z.array(z.number().refine(Number.isFinite, 'expected a finite number'))]))
    .optional(),
  onProgress: z.custom<(progress: ChainProgress) => void>((v) => typeof v === 'function').optional(),
  keepWarmup: z.boolean().optional(),
  signal: z.custom<AbortSignal>((v) => typeof AbortSignal !== 'undefined' && v instanceof AbortSignal).optional(),
});

/** `runChains` options after validation and defaults. */
export interface ResolvedRunOptions {
  readonly settings: ChainSettings;
  readonly chains: number;
  readonly seed: number | undefined;
  readonly init: readonly ArrayLike<number>[] | undefined;
  readonly onProgress: ((progress: ChainProgress) => void) | undefined;
  readonly keepWarmup: boolean;
  readonly signal: AbortSignal | undefined;
}

/** Validates `runChains` options; throws `SamplerOptionsError` naming the bad option. */
export function resolveRunOptions(input: unknown, entry = 'runChains'): ResolvedRunOptions {
  const o = parseOptions(runOptionsSchema, input, entry, runOptionsExpected);
  const { chains, seed, init, onProgress, keepWarmup, signal, ...rest } = o;
  return {
    settings: settingsFromParsed(rest, entry),
    chains: chains ?? 4,
    seed,
    init,
    onProgress,
    keepWarmup: keepWarmup ?? false,
    signal,
  };
}

import { availableParallelism } from 'node:os';
import { z } from 'zod';
import { describeValue } from '../sampler/optionErrors.js';
import { resolveRunOptions, type ResolvedRunOptions, type RunOptions } from '../sampler/runOptions.js';
import { resolveConvergenceCriteria, type ResolvedConvergenceCriteria } from './convergence.js';
import type { LongRunOptions } from './longRunOptions.js';
import { RunOptionsError } from './errors.js';
import type { RunProgress } from './progressTracker.js';

/** Options of `executeRun`: those of `runChains` plus the long-run machinery. */
export interface ExecuteRunOptions extends Omit<RunOptions, 'onProgress'>, LongRunOptions {
  /** Called with every chain's progress several times a second (a `ChainProgress` plus all chains' lines). */
  onProgress?: (progress: RunProgress) => void;
}

/** Runner-only options after validation. */
export interface ResolvedRunnerOptions {
  readonly threads: number | null;
  readonly folder: string | null;
  readonly checkpointEvery: number;
  readonly minCheckpointSeconds: number;
  readonly syncSeconds: number;
  readonly progress: boolean | null;
  readonly onProgress: ((progress: RunProgress) => void) | null;
  readonly untilConverged: ResolvedConvergenceCriteria | null;
  readonly label: string | null;
}

const runnerKeys = ['threads', 'folder', 'checkpointEvery', 'minCheckpointSeconds', 'syncSeconds', 'progress', 'onProgress', 'untilConverged', 'label'] as const;

const runnerExpected: Record<(typeof runnerKeys)[number], string> = {
  threads: 'an integer from 0 to 256',
  folder: 'a non-empty path',
  checkpointEvery: 'an integer >= 0 (iterations; 0 for none)',
  minCheckpointSeconds: 'a number >= 0 (seconds)',
  syncSeconds: 'a number > 0 (seconds)',
  progress: 'true or false',
  onProgress: 'a function',
  untilConverged: 'true, false or an object of convergence criteria',
  label: 'a string of at most 10000 characters',
};

const runnerSchema = z.object({
  threads: z.number().int().min(0).max(256).optional(),
  folder: z.string().min(1).optional(),
  checkpointEvery: z.number().int().min(0).max(1e12).optional(),
  minCheckpointSeconds: z.number().min(0).finite().optional(),
  syncSeconds: z.number().gt(0).finite().optional(),
  progress: z.boolean().optional(),
  onProgress: z.custom<(p: RunProgress) => void>((v) => typeof v === 'function').optional(),
  untilConverged: z.union([z.boolean(), z.record(z.string(), z.unknown())]).optional(),
  label: z.string().max(10000).optional(),
});

/**
 * Splits and validates options: sampler options by `resolveRunOptions` (its errors
 * name the option), runner options here. `draws` and `untilConverged` exclude each
 * other. Throws {@link RunOptionsError} or the sampler's `SamplerOptionsError`.
 */
export function resolveExecuteOptions(
  input: unknown,
  entry = 'executeRun',
): { sampler: ResolvedRunOptions; runner: ResolvedRunnerOptions } {
  if (input !== undefined && (input === null || typeof input !== 'object' || Array.isArray(input))) {
    throw new RunOptionsError(`${entry}: options = ${describeValue(input)}: expected an object`);
  }
  const all = (input ?? {}) as Record<string, unknown>;
  const samplerPart: Record<string, unknown> = {};
  const runnerPart: Record<string, unknown> = {};
  for (const [k, v] of Object.entries(all)) {
    if (v === undefined) continue;
    if ((runnerKeys as readonly string[]).includes(k)) runnerPart[k] = v;
    else samplerPart[k] = v;
  }
  const parsed = runnerSchema.safeParse(runnerPart);
  if (!parsed.success) {
    const key = String(parsed.error.issues[0].path[0]) as (typeof runnerKeys)[number];
    throw new RunOptionsError(`${entry}: option \`${key}\` = ${describeValue(runnerPart[key])}: expected ${runnerExpected[key]}`);
  }
  const r = parsed.data;
  const untilConverged = r.untilConverged === undefined || r.untilConverged === false ? null : resolveConvergenceCriteria(r.untilConverged);
  if (untilConverged !== null && samplerPart.draws !== undefined) {
    throw new RunOptionsError(
      `${entry}: options \`draws\` = ${describeValue(samplerPart.draws)} and \`untilConverged\` exclude each other: a run until converged sets its own length (cap it with untilConverged.maxDraws)`,
    );
  }
  if (untilConverged !== null) samplerPart.draws = untilConverged.maxDraws;
  const sampler = resolveRunOptions(samplerPart, entry);
  return {
    sampler,
    runner: {
      threads: r.threads ?? null,
      folder: r.folder ?? null,
      checkpointEvery: r.checkpointEvery ?? 500,
      minCheckpointSeconds: r.minCheckpointSeconds ?? 10,
      syncSeconds: r.syncSeconds ?? 5,
      progress: r.progress ?? null,
      onProgress: r.onProgress ?? null,
      untilConverged,
      label: r.label ?? null,
    },
  };
}

/** Default worker threads for a rebuildable target: min(chains, cores), or 0 when that is 1. */
export function defaultThreads(chains: number, cores = availableParallelism()): number {
  const n = Math.min(chains, cores);
  return n >= 2 ? n : 0;
}

import { z } from 'zod';
import { OptionError } from '../errors.js';

/**
 * State of the running (incremental) diagnostics: fixed-size typed arrays whose size
 * depends on the options only, never on how many draws have arrived. Plain data, so it
 * can be copied with structuredClone or written to a checkpoint.
 *
 * For each quantity q and chain c (slot k = q * chains + c) it keeps:
 * - running sums for the autocovariances at lags 0..lagWindow (sum of y_t y_{t-l}), with
 *   the first and the last lagWindow values (y = x - shift, shift = the chain's first draw,
 *   which keeps the sums well conditioned);
 * - a ladder of at most `batches` batch summaries (count, mean, sum of squared deviations),
 *   merged pairwise when full so the batch size doubles;
 * - a thinned reservoir of at most `reservoir` raw draws (every t-th draw; when full, every
 *   other kept draw is dropped and t doubles).
 */
export interface RunningDiagnosticsState {
  readonly chains: number;
  readonly dim: number;
  readonly names: readonly string[];
  readonly lagWindow: number;
  readonly batches: number;
  readonly reservoir: number;
  /** Draws received, per chain. */
  readonly count: Float64Array;
  /** Current batch size, per chain. */
  readonly batchSize: Float64Array;
  /** Closed batches held, per chain. */
  readonly closedBatches: Float64Array;
  /** Draws in the open batch, per chain. */
  readonly openCount: Float64Array;
  /** Reservoir thinning (keep every t-th draw), per chain. */
  readonly thinning: Float64Array;
  /** Draws held in the reservoir, per chain. */
  readonly reservoirCount: Float64Array;
  readonly shift: Float64Array;
  readonly sum: Float64Array;
  readonly lagSums: Float64Array;
  readonly head: Float64Array;
  readonly ring: Float64Array;
  readonly batchMean: Float64Array;
  readonly batchM2: Float64Array;
  readonly openMean: Float64Array;
  readonly openM2: Float64Array;
  readonly reservoirDraws: Float64Array;
}

export interface RunningDiagnosticsOptions {
  /** Number of chains. */
  chains: number;
  /** Scalar quantities per draw (default 1). */
  dim?: number;
  /** Quantity names (default x[0], x[1], ...). */
  names?: readonly string[];
  /** Largest autocovariance lag kept exactly (default 128; cost per draw is about this many multiply-adds per quantity). */
  lagWindow?: number;
  /** Batch summaries per chain, even (default 256). */
  batches?: number;
  /** Reservoir size per chain, even (default 1024). */
  reservoir?: number;
}

const optionsSchema = z.object({
  chains: z.number().int().min(1),
  dim: z.number().int().min(1).optional(),
  names: z.array(z.string()).optional(),
  lagWindow: z.number().int().min(2).max(65536).optional(),
  batches: z
    .number()
    .int()
    .min(8)
    .max(1 << 20)
    .refine((v) => v % 2 === 0, { message: 'expected an even number' })
    .optional(),
  reservoir: z
    .number()
    .int()
    .min(16)
    .max(1 << 24)
    .refine((v) => v % 2 === 0, { message: 'expected an even number' })
    .optional(),
});

/** Creates an empty state. @throws OptionError */
export function createRunningDiagnostics(options: RunningDiagnosticsOptions): RunningDiagnosticsState {
  const parsed = optionsSchema.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const key = issue.path.map(String).join('.');
    const value = options !== null && typeof options === 'object' ? (options as unknown as Record<string, unknown>)[String(issue.path[0])] : options;
    throw new OptionError(`options${key ? '.' + key : ''}`, `options${key ? '.' + key : ''}: ${issue.message}, got ${JSON.stringify(value)}`);
  }
  const o = parsed.data;
  const chains = o.chains;
  const dim = o.dim ?? 1;
  const names = o.names ?? Array.from({ length: dim }, (_, j) => `x[${j}]`);
  if (names.length !== dim) throw new OptionError('options.names', `options.names: expected ${dim} names (one per quantity), got ${names.length}`);
  const lagWindow = o.lagWindow ?? 128;
  const batches = o.batches ?? 256;
  const reservoir = o.reservoir ?? 1024;
  const slots = chains * dim;
  return {
    chains,
    dim,
    names: [...names],
    lagWindow,
    batches,
    reservoir,
    count: new Float64Array(chains),
    batchSize: new Float64Array(chains).fill(1),
    closedBatches: new Float64Array(chains),
    openCount: new Float64Array(chains),
    thinning: new Float64Array(chains).fill(1),
    reservoirCount: new Float64Array(chains),
    shift: new Float64Array(slots),
    sum: new Float64Array(slots),
    lagSums: new Float64Array(slots * (lagWindow + 1)),
    head: new Float64Array(slots * lagWindow),
    ring: new Float64Array(slots * lagWindow),
    batchMean: new Float64Array(slots * batches),
    batchM2: new Float64Array(slots * batches),
    openMean: new Float64Array(slots),
    openM2: new Float64Array(slots),
    reservoirDraws: new Float64Array(slots * reservoir),
  };
}

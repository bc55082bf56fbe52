import { z } from 'zod';
import { ChainShapeError, NonFiniteDrawError, TooFewDrawsError } from './errors.js';

/** One chain of one scalar quantity: a plain array or any numeric typed array. */
export type ChainDraws = ArrayLike<number>;

/** Draws of one scalar quantity: one entry per chain. */
export type ChainsInput = readonly ChainDraws[];

/** Chains after validation: equal-length float64 views (truncated to the shortest chain). */
export interface PreparedChains {
  /** One view per chain, all of length `draws`. Never mutated. */
  readonly chains: Float64Array[];
  /** Number of chains. */
  readonly count: number;
  /** Draws per chain after truncation. */
  readonly draws: number;
  /** Lengths as given, before truncation. */
  readonly givenLengths: number[];
  /** True when some chain was longer than the shortest one and was cut. */
  readonly truncated: boolean;
}

function isNumericTypedArray(value: unknown): value is ArrayLike<number> {
  return ArrayBuffer.isView(value) && !(value instanceof DataView) && !(value instanceof BigInt64Array) && !(value instanceof BigUint64Array);
}

/** A single chain: a plain array or a numeric typed array (elements checked by `chainsSchema`). */
export const chainSchema = z.custom<ChainDraws>((value) => Array.isArray(value) || isNumericTypedArray(value), {
  message: 'expected an array or a numeric typed array of draws',
});

/**
 * Schema of the `chains` argument: at least one chain, each an array or typed array whose
 * entries are finite numbers. Non-finite entries are reported with `params.kind = 'non-finite'`.
 */
export const chainsSchema = z
  .array(chainSchema)
  .min(1, { message: 'expected at least one chain' })
  .superRefine((chains, ctx) => {
    for (let c = 0; c < chains.length; c++) {
      const chain = chains[c];
      const plain = Array.isArray(chain);
      for (let i = 0; i < chain.length; i++) {
        const v = chain[i];
        if (plain && typeof v !== 'number') {
          ctx.addIssue({ code: 'custom', path: [c, i], message: `expected a number, got ${typeof v}`, params: { kind: 'not-number', value: v } });
          return;
        }
        if (!Number.isFinite(v)) {
          ctx.addIssue({ code: 'custom', path: [c, i], message: 'expected a finite number', params: { kind: 'non-finite', value: v } });
          return;
        }
      }
    }
  });

function describe(value: unknown): string {
  if (value === null) return 'null';
  if (Array.isArray(value)) return `an array of length ${value.length}`;
  if (ArrayBuffer.isView(value)) return `a ${value.constructor.name}`;
  if (typeof value === 'object') return 'an object';
  return `${typeof value} ${String(value)}`;
}

/**
 * Validates `chains` with zod and returns equal-length float64 views.
 * Chains of unequal length are truncated to the shortest (flagged by `truncated`).
 * @param field name used in error messages (e.g. `chains`, `quantities.period`)
 * @throws ChainShapeError, NonFiniteDrawError
 */
export function prepareChains(input: unknown, field = 'chains'): PreparedChains {
  const parsed = chainsSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const path = issue.path;
    const params = (issue as { params?: { kind?: string; value?: unknown } }).params;
    if (params?.kind === 'non-finite' && path.length === 2) {
      throw new NonFiniteDrawError(field, Number(path[0]), Number(path[1]), Number(params.value));
    }
    if (params?.kind === 'not-number' && path.length === 2) {
      throw new ChainShapeError(`${field}[${String(path[0])}][${String(path[1])}]`, `${field}[${String(path[0])}][${String(path[1])}]: expected a finite number, got ${describe(params.value)}`);
    }
    if (path.length === 0) {
      if (!Array.isArray(input)) throw new ChainShapeError(field, `${field}: expected an array of chains (arrays or typed arrays of draws), got ${describe(input)}`);
      throw new ChainShapeError(field, `${field}: expected at least one chain, got an empty array`);
    }
    const where = `${field}[${String(path[0])}]`;
    const bad = Array.isArray(input) ? (input as unknown[])[Number(path[0])] : undefined;
    throw new ChainShapeError(where, `${where}: expected an array or a numeric typed array of draws, got ${describe(bad)}`);
  }
  const chains = parsed.data;
  const givenLengths = chains.map((c) => c.length);
  const draws = Math.min(...givenLengths);
  const views = chains.map((c) => {
    if (c instanceof Float64Array) return c.length === draws ? c : c.subarray(0, draws);
    const out = new Float64Array(draws);
    for (let i = 0; i < draws; i++) out[i] = c[i];
    return out;
  });
  return { chains: views, count: chains.length, draws, givenLengths, truncated: givenLengths.some((n) => n !== draws) };
}

/** Smallest chain length the split-chain diagnostics accept (4 draws in each half). */
export const MIN_DRAWS_PER_CHAIN = 8;

/**
 * Refuses chains with fewer than 4 draws per split half.
 * @throws TooFewDrawsError naming the field and the shortest chain
 */
export function requireSplittable(prepared: PreparedChains, field = 'chains'): void {
  if (prepared.draws >= MIN_DRAWS_PER_CHAIN) return;
  const shortest = prepared.givenLengths.indexOf(prepared.draws);
  throw new TooFewDrawsError(
    field,
    `${field}: each chain needs at least ${MIN_DRAWS_PER_CHAIN} draws (4 in each split half), but ${field}[${shortest}] has ${prepared.draws}`,
  );
}

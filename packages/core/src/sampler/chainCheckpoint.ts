import { z } from 'zod';
import { RandomStateError, restoreRandomStream, type RandomStreamState } from '../random/index.js';
import type { ChainState } from './chainState.js';
import type { DualAveragingState } from './dualAveraging.js';
import { ChainStateError } from './errors.js';
import { metricFromCovariance } from './metricFromCovariance.js';
import { identityMetric, type Metric, type MetricKind } from './metric.js';
import { createWelford } from './welford.js';

/** Format tag and version of {@link SerialisedChainState}. */
export const chainStateFormat = 'apsis-chain-state';
export const chainStateVersion = 2;

/**
 * A chain state as plain JSON data (numbers, strings, arrays, objects only; every
 * number finite). `JSON.parse(JSON.stringify(x))` restores to an equal state, since
 * JavaScript prints float64 numbers with round-trip precision.
 */
export interface SerialisedChainState {
  readonly format: typeof chainStateFormat;
  readonly version: typeof chainStateVersion;
  readonly chain: number;
  readonly seed: number;
  readonly dim: number;
  readonly iteration: number;
  readonly position: number[];
  readonly gradient: number[];
  readonly logDensity: number;
  readonly stepSize: number;
  readonly dualAveraging: DualAveragingState;
  /** Inverse mass: `dim` variances (diagonal), `dim × dim` row-major (dense), null (unit). */
  readonly metric: { readonly kind: MetricKind; readonly inverseMass: number[] | null };
  readonly welford: {
    readonly kind: 'diagonal' | 'dense';
    readonly count: number;
    readonly mean: number[];
    readonly m2: number[];
  } | null;
  readonly rng: RandomStreamState;
  readonly divergences: { readonly warmup: number; readonly sampling: number };
}

function toNumbers(x: Float64Array, field: string): number[] {
  const out = Array.from(x);
  for (let i = 0; i < out.length; i++) {
    if (!Number.isFinite(out[i])) {
      throw new ChainStateError(`cannot serialise chain state: ${field}[${i}] = ${out[i]} is not finite`);
    }
  }
  return out;
}

function finiteScalar(x: number, field: string): number {
  if (!Number.isFinite(x)) {
    throw new ChainStateError(`cannot serialise chain state: ${field} = ${x} is not finite`);
  }
  return x;
}

/** A JSON-safe copy of `state` (no references into it). */
export function serialiseChainState(state: ChainState): SerialisedChainState {
  const da = state.dualAveraging;
  const m = state.metric;
  const w = state.welford;
  return {
    format: chainStateFormat,
    version: chainStateVersion,
    chain: state.chain,
    seed: state.seed,
    dim: state.dim,
    iteration: state.iteration,
    position: toNumbers(state.position, 'position'),
    gradient: toNumbers(state.gradient, 'gradient'),
    logDensity: finiteScalar(state.logDensity, 'logDensity'),
    stepSize: finiteScalar(state.stepSize, 'stepSize'),
    dualAveraging: {
      mu: finiteScalar(da.mu, 'dualAveraging.mu'),
      logStepSize: finiteScalar(da.logStepSize, 'dualAveraging.logStepSize'),
      logStepSizeAverage: finiteScalar(da.logStepSizeAverage, 'dualAveraging.logStepSizeAverage'),
      acceptanceGap: finiteScalar(da.acceptanceGap, 'dualAveraging.acceptanceGap'),
      count: da.count,
      priorUpdates: da.priorUpdates,
    },
    metric: { kind: m.kind, inverseMass: m.kind === 'unit' ? null : toNumbers(m.inverseMass, 'metric.inverseMass') },
    welford:
      w === null
        ? null
        : { kind: w.kind, count: w.count, mean: toNumbers(w.mean, 'welford.mean'), m2: toNumbers(w.m2, 'welford.m2') },
    rng: state.rng.getState(),
    divergences: { warmup: state.divergences.warmup, sampling: state.divergences.sampling },
  };
}

const finiteNumber = z.number().refine(Number.isFinite, 'expected a finite number');
const count = z.number().int().min(0);

const serialisedSchema = z.object({
  format: z.literal(chainStateFormat),
  // Version 1 states predate `dualAveraging.priorUpdates`; their warmup restarted dual
  // averaging in full after every window, which is priorUpdates = 0.
  version: z.union([z.literal(1), z.literal(chainStateVersion)]),
  chain: count,
  seed: z.number().int().refine(Number.isSafeInteger, 'expected a safe integer'),
  dim: z.number().int().min(1),
  iteration: count,
  position: z.array(finiteNumber),
  gradient: z.array(finiteNumber),
  logDensity: finiteNumber,
  stepSize: finiteNumber.pipe(z.number().gt(0)),
  dualAveraging: z.object({
    mu: finiteNumber,
    logStepSize: finiteNumber,
    logStepSizeAverage: finiteNumber,
    acceptanceGap: finiteNumber,
    count,
    priorUpdates: count.optional(),
  }),
  metric: z.object({
    kind: z.enum(['unit', 'diagonal', 'dense']),
    inverseMass: z.array(finiteNumber).nullable(),
  }),
  welford: z
    .object({
      kind: z.enum(['diagonal', 'dense']),
      count,
      mean: z.array(finiteNumber),
      m2: z.array(finiteNumber),
    })
    .nullable(),
  rng: z.unknown(),
  divergences: z.object({ warmup: count, sampling: count }),
});

/**
 * Rebuilds a live chain state from {@link serialiseChainState}'s output (or its JSON
 * round trip). Continuing it gives bit-identical draws to the uninterrupted chain.
 * Throws {@link ChainStateError} naming the first inconsistent field.
 */
export function restoreChainState(data: unknown): ChainState {
  const parsed = serialisedSchema.safeParse(data);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const field = issue.path.map((k) => (typeof k === 'number' ? `[${k}]` : `.${String(k)}`)).join('');
    throw new ChainStateError(`restoreChainState: field \`${field.replace(/^\./, '') || '(root)'}\`: ${issue.message}`);
  }
  const s = parsed.data;
  if (s.version === chainStateVersion && s.dualAveraging.priorUpdates === undefined) {
    throw new ChainStateError(`restoreChainState: field \`dualAveraging.priorUpdates\`: required in version ${chainStateVersion}`);
  }
  const dim = s.dim;
  const lengthCheck = (field: string, actual: number, expected: number): void => {
    if (actual !== expected) {
      throw new ChainStateError(`restoreChainState: field \`${field}\` has length ${actual}: expected ${expected}`);
    }
  };
  lengthCheck('position', s.position.length, dim);
  lengthCheck('gradient', s.gradient.length, dim);
  let metric: Metric;
  if (s.metric.kind === 'unit') {
    metric = identityMetric('unit', dim);
  } else {
    const inv = s.metric.inverseMass;
    if (inv === null) {
      throw new ChainStateError(`restoreChainState: field \`metric.inverseMass\` is null for kind '${s.metric.kind}'`);
    }
    lengthCheck('metric.inverseMass', inv.length, s.metric.kind === 'dense' ? dim * dim : dim);
    const m = metricFromCovariance(s.metric.kind, Float64Array.from(inv), dim);
    if (m === null) {
      throw new ChainStateError('restoreChainState: field `metric.inverseMass` is not positive definite');
    }
    metric = m;
  }
  let welford = null;
  if (s.welford !== null) {
    welford = createWelford(s.welford.kind, dim);
    lengthCheck('welford.mean', s.welford.mean.length, dim);
    lengthCheck('welford.m2', s.welford.m2.length, s.welford.kind === 'dense' ? dim * dim : dim);
    welford.count = s.welford.count;
    welford.mean.set(s.welford.mean);
    welford.m2.set(s.welford.m2);
  }
  let rng;
  try {
    rng = restoreRandomStream(s.rng as RandomStreamState);
  } catch (e) {
    if (e instanceof RandomStateError) throw new ChainStateError(`restoreChainState: field \`rng\`: ${e.message}`);
    throw e;
  }
  return {
    chain: s.chain,
    seed: s.seed,
    dim,
    iteration: s.iteration,
    position: Float64Array.from(s.position),
    gradient: Float64Array.from(s.gradient),
    logDensity: s.logDensity,
    stepSize: s.stepSize,
    dualAveraging: { ...s.dualAveraging, priorUpdates: s.dualAveraging.priorUpdates ?? 0 },
    metric,
    welford,
    rng,
    divergences: { ...s.divergences },
  };
}

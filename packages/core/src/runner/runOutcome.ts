import { existsSync, readFileSync } from 'node:fs';
import { z } from 'zod';
import { writeFileAtomic } from './atomicWrite.js';
import { RunFolderError } from './errors.js';
import { resolveInside } from './folderPaths.js';
import type { RunManifest } from './runManifest.js';
import type { ChainAdaptation } from '../sampler/runChains.js';

/** File name of the outcome, written once when a run ends. */
export const outcomeFile = 'outcome.json';
export const outcomeFormat = 'apsis-run-outcome';

/**
 * Why a run stopped: `completed` (a fixed-length run drew all its draws), `converged`
 * (every checked quantity met the criteria), `draw-cap` or `time-cap` (a run until
 * converged hit its limit first).
 */
export type StopReason = 'completed' | 'converged' | 'draw-cap' | 'time-cap';

/** How and when a run stopped. */
export interface RunStop {
  readonly reason: StopReason;
  /** Draws per chain kept (after warmup). */
  readonly drawsPerChain: number;
  /** One sentence for people. */
  readonly message: string;
  /** Failures at the last convergence check (empty when converged or not checked). */
  readonly failures: readonly string[];
}

/** The contents of `outcome.json`. */
export interface RunOutcome {
  readonly format: typeof outcomeFormat;
  readonly version: 1;
  readonly runId: string;
  readonly finishedAt: string;
  /** Wall-clock seconds over all sessions of the run. */
  readonly elapsedSeconds: number;
  readonly stop: RunStop;
  /** Per chain: the adapted step size and inverse mass matrix (diagonal: dim numbers; dense: dim × dim row-major; unit: null). */
  readonly adaptation: readonly StoredAdaptation[];
}

/** A chain's adaptation as JSON. */
export interface StoredAdaptation {
  readonly stepSize: number;
  readonly metric: { readonly kind: 'unit' | 'diagonal' | 'dense'; readonly inverseMass: readonly number[] | null };
}

/** The JSON form of a chain's adaptation. */
export function storeAdaptation(a: ChainAdaptation): StoredAdaptation {
  return { stepSize: a.stepSize, metric: { kind: a.metric.kind, inverseMass: a.metric.kind === 'unit' ? null : Array.from(a.metric.inverseMass) } };
}

/** A chain's adaptation from its JSON form. */
export function loadAdaptation(a: StoredAdaptation): ChainAdaptation {
  return a.metric.kind === 'unit' || a.metric.inverseMass === null
    ? { stepSize: a.stepSize, metric: { kind: 'unit' } }
    : { stepSize: a.stepSize, metric: { kind: a.metric.kind, inverseMass: Float64Array.from(a.metric.inverseMass) } };
}

const finite = z.number().refine(Number.isFinite, 'expected a finite number');

const outcomeSchema = z.strictObject({
  format: z.literal(outcomeFormat),
  version: z.literal(1),
  runId: z.string().regex(/^[0-9a-f]{32}$/),
  finishedAt: z.string().max(64),
  elapsedSeconds: z.number().min(0).finite(),
  stop: z.strictObject({
    reason: z.enum(['completed', 'converged', 'draw-cap', 'time-cap']),
    drawsPerChain: z.number().int().min(0),
    message: z.string().max(10000),
    failures: z.array(z.string().max(10000)).max(100000),
  }),
  adaptation: z.array(
    z.strictObject({
      stepSize: finite,
      metric: z.strictObject({ kind: z.enum(['unit', 'diagonal', 'dense']), inverseMass: z.array(finite).nullable() }),
    }),
  ),
});

/** Writes the outcome atomically. */
export function writeOutcome(folder: string, outcome: RunOutcome): void {
  writeFileAtomic(resolveInside(folder, outcomeFile, 'outcome'), JSON.stringify(outcome, null, 2) + '\n');
}

/** The outcome of a finished run, null while it has not finished; throws RunFolderError when damaged. */
export function readOutcome(folder: string, manifest: RunManifest): RunOutcome | null {
  const path = resolveInside(folder, outcomeFile, 'outcome');
  if (!existsSync(path)) return null;
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, 'utf8'));
  } catch (e) {
    throw new RunFolderError(`${folder}/${outcomeFile} is damaged: ${(e as Error).message}`);
  }
  const parsed = outcomeSchema.safeParse(raw);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    throw new RunFolderError(`${folder}/${outcomeFile}: field \`${issue.path.join('.')}\`: ${issue.message}`);
  }
  if (parsed.data.runId !== manifest.runId) throw new RunFolderError(`${folder}/${outcomeFile} belongs to another run (run id ${parsed.data.runId})`);
  if (parsed.data.adaptation.length !== manifest.chains) {
    throw new RunFolderError(`${folder}/${outcomeFile}: adaptation has ${parsed.data.adaptation.length} entries: expected one per chain (${manifest.chains})`);
  }
  return parsed.data as RunOutcome;
}

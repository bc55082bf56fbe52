import { createHash } from 'node:crypto';
import { existsSync, lstatSync, readFileSync, statSync } from 'node:fs';
import { z } from 'zod';
import type { SerialisedChainState } from '../sampler/chainCheckpoint.js';
import { writeFileAtomic } from './atomicWrite.js';
import { CheckpointError } from './errors.js';
import { resolveInside } from './folderPaths.js';
import type { RunManifest } from './runManifest.js';

/** Value of a checkpoint file's `format` field. */
export const checkpointFormat = 'apsis-run-checkpoint';
export const checkpointVersion = 1;

/** One chain in a checkpoint: its full state and how much of its trace file belongs to it. */
export interface CheckpointChain {
  readonly chain: number;
  /** Rows of the trace file up to the state (= the state's iteration). */
  readonly rows: number;
  /** Byte length of the trace file up to and including row `rows − 1`. */
  readonly traceBytes: number;
  readonly state: SerialisedChainState;
}

/** What a checkpoint records: every chain at the same iteration. */
export interface CheckpointBody {
  readonly runId: string;
  /** 1, 2, 3, …: written to slot (generation mod 2), so the previous one survives. */
  readonly generation: number;
  /** Iterations completed by every chain (warmup included). */
  readonly iteration: number;
  readonly savedAt: string;
  /** Wall-clock seconds the run had taken up to this checkpoint (over all sessions). */
  readonly elapsedSeconds: number;
  readonly chains: readonly CheckpointChain[];
}

const count = z.number().int().min(0);
const bodySchema = z.strictObject({
  runId: z.string().regex(/^[0-9a-f]{32}$/),
  generation: z.number().int().min(1),
  iteration: count,
  savedAt: z.string().max(64),
  elapsedSeconds: z.number().min(0).finite(),
  chains: z.array(z.strictObject({ chain: count, rows: count, traceBytes: count, state: z.record(z.string(), z.unknown()) })),
});
const fileSchema = z.strictObject({
  format: z.literal(checkpointFormat),
  version: z.literal(checkpointVersion),
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  body: z.unknown(),
});

const digest = (text: string): string => createHash('sha256').update(text, 'utf8').digest('hex');

/** Writes `body` atomically into slot (generation mod 2) of the manifest's checkpoint files. */
export function writeCheckpoint(folder: string, manifest: RunManifest, body: CheckpointBody): void {
  if (manifest.checkpoints === null) throw new CheckpointError('this run keeps no checkpoints');
  const text = JSON.stringify(body);
  const file = `{"format":${JSON.stringify(checkpointFormat)},"version":${checkpointVersion},"sha256":"${digest(text)}","body":${text}}\n`;
  const slot = manifest.checkpoints.slots[body.generation % 2];
  writeFileAtomic(resolveInside(folder, slot, 'checkpoint slot'), file);
}

/** Reads one checkpoint file; returns the body or a reason it cannot be used. */
function readSlot(folder: string, manifest: RunManifest, slot: string): { body: CheckpointBody } | { problem: string } | null {
  const path = resolveInside(folder, slot, 'checkpoint slot');
  if (!existsSync(path)) return null;
  if (lstatSync(path).isSymbolicLink()) return { problem: 'it is a symbolic link' };
  if (statSync(path).size > 1024 * 1024 * 1024) return { problem: 'it is larger than any checkpoint apsis writes' };
  let raw: unknown;
  try {
    raw = JSON.parse(readFileSync(path, 'utf8'));
  } catch (e) {
    return { problem: `it is not valid JSON (damaged or truncated: ${(e as Error).message})` };
  }
  const file = fileSchema.safeParse(raw);
  if (!file.success) return { problem: `it is not an apsis checkpoint (${file.error.issues[0].message} at \`${file.error.issues[0].path.join('.')}\`)` };
  const text = JSON.stringify(file.data.body);
  if (digest(text) !== file.data.sha256) return { problem: 'its contents do not match their SHA-256 digest (the file is damaged)' };
  const body = bodySchema.safeParse(file.data.body);
  if (!body.success) return { problem: `its body is malformed (${body.error.issues[0].message} at \`${body.error.issues[0].path.join('.')}\`)` };
  const b = body.data;
  if (b.runId !== manifest.runId) return { problem: `it belongs to another run (run id ${b.runId}, the manifest says ${manifest.runId})` };
  if (b.chains.length !== manifest.chains || b.chains.some((c, i) => c.chain !== i || c.rows !== b.iteration)) {
    return { problem: `its chains do not match the manifest (${b.chains.length} chains, expected ${manifest.chains}, all at iteration ${b.iteration})` };
  }
  return { body: b as unknown as CheckpointBody };
}

/** The newest usable checkpoint of a run, and notes on any that were passed over. */
export interface CheckpointChoice {
  readonly checkpoint: CheckpointBody | null;
  readonly notes: string[];
}

/**
 * Picks the newest usable checkpoint among the two slots. A damaged or foreign file
 * is passed over with a note naming it and the reason; when both exist and neither
 * is usable, throws {@link CheckpointError}.
 */
export function readLatestCheckpoint(folder: string, manifest: RunManifest): CheckpointChoice {
  if (manifest.checkpoints === null) return { checkpoint: null, notes: [] };
  const notes: string[] = [];
  const good: CheckpointBody[] = [];
  const problems: string[] = [];
  for (const slot of manifest.checkpoints.slots) {
    const r = readSlot(folder, manifest, slot);
    if (r === null) continue;
    if ('problem' in r) problems.push(`checkpoint ${slot} cannot be used: ${r.problem}`);
    else good.push(r.body);
  }
  good.sort((a, b) => b.generation - a.generation);
  const chosen = good[0] ?? null;
  if (chosen === null && problems.length > 0) {
    throw new CheckpointError(
      `${problems.join('; ')}. No usable checkpoint is left; to start the run again from its first iteration, delete the checkpoint files in ${folder}`,
    );
  }
  for (const p of problems) notes.push(`${p}; using generation ${chosen!.generation} (iteration ${chosen!.iteration}) instead`);
  return { checkpoint: chosen, notes };
}

import { existsSync, lstatSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { z } from 'zod';
import { resolveChainSettings, type ChainSettings, type ChainSettingsInput } from '../sampler/chainSettings.js';
import { SamplerOptionsError } from '../sampler/errors.js';
import { resolvedCriteriaSchema, type ResolvedConvergenceCriteria } from './convergence.js';
import { RunFolderError } from './errors.js';
import { checkRelativePath, resolveInside } from './folderPaths.js';
import { targetRecipeSchema, type ResolvedTargetRecipe } from './targetRecipe.js';

/** File name of the manifest; its presence marks a folder as a run folder. */
export const manifestFile = 'apsis-run.json';
/** Value of the manifest's `format` field. */
export const runFolderFormat = 'apsis-run-folder';
/** Version of the run-folder format written by this code. */
export const runFolderVersion = 1;

/**
 * The manifest of a run folder: everything needed to read the traces and to continue
 * the run. Written once, atomically, when the run starts.
 */
export interface RunManifest {
  readonly format: typeof runFolderFormat;
  readonly version: typeof runFolderVersion;
  /** Random identifier (32 hex digits) shared by the run's checkpoints and outcome. */
  readonly runId: string;
  /** ISO 8601 time the run started. */
  readonly createdAt: string;
  /** Versions of the software that made the run (package name → version; `node`). */
  readonly software: Readonly<Record<string, string>>;
  /** Free text given by the user (null when none). */
  readonly label: string | null;
  readonly seed: number;
  readonly chains: number;
  /** Unconstrained dimension of the target. */
  readonly dim: number;
  /** Sampler knobs, every one explicit (re-resolved and compared with `settings` on resume). */
  readonly sampler: ChainSettingsInput;
  /** The resolved sampler settings the run used. */
  readonly settings: ChainSettings;
  /** Starting positions, one per chain, or null for random starts from the seed. */
  readonly init: readonly (readonly number[])[] | null;
  readonly columns: { readonly coordinates: readonly string[]; readonly outputs: readonly string[] };
  /** Trace file of each chain, relative to the folder. */
  readonly traces: readonly string[];
  /** Checkpoint period (iterations) and the two alternating checkpoint files; null: none. */
  readonly checkpoints: { readonly every: number; readonly slots: readonly [string, string] } | null;
  /** How to rebuild the target; null when it was an in-memory object. */
  readonly recipe: ResolvedTargetRecipe | null;
  /** Run-until-converged criteria; null for a run of fixed length. */
  readonly untilConverged: ResolvedConvergenceCriteria | null;
}

const name = z.string().max(1000);
const finite = z.number().refine(Number.isFinite, 'expected a finite number');

const manifestSchema = z.strictObject({
  format: z.literal(runFolderFormat),
  version: z.literal(runFolderVersion),
  runId: z.string().regex(/^[0-9a-f]{32}$/, 'expected 32 hexadecimal digits'),
  createdAt: z.string().max(64),
  software: z.record(z.string().max(200), z.string().max(200)),
  label: z.string().max(10000).nullable(),
  seed: z.number().int().min(0).refine(Number.isSafeInteger, 'expected a safe integer'),
  chains: z.number().int().min(1).max(1024),
  dim: z.number().int().min(1).max(10_000_000),
  sampler: z.record(z.string().max(100), z.union([z.string().max(100), finite])),
  settings: z.json(),
  init: z.array(z.array(finite)).nullable(),
  columns: z.strictObject({ coordinates: z.array(name), outputs: z.array(name) }),
  traces: z.array(z.string().max(255)),
  checkpoints: z
    .strictObject({ every: z.number().int().min(1).max(1e12), slots: z.tuple([z.string().max(255), z.string().max(255)]) })
    .nullable(),
  recipe: targetRecipeSchema.nullable(),
  untilConverged: resolvedCriteriaSchema.nullable(),
});

/** The explicit sampler knobs that resolve to `settings`. */
export function samplerKnobs(settings: ChainSettings): ChainSettingsInput {
  const knobs: ChainSettingsInput = {
    method: settings.method,
    warmup: settings.warmup,
    draws: settings.draws,
    metric: settings.metric,
    targetAcceptance: settings.targetAcceptance,
    maxTreeDepth: settings.maxTreeDepth,
  };
  if (settings.method === 'hmc') {
    if ('steps' in settings.path) knobs.steps = settings.path.steps;
    else knobs.pathLength = settings.path.pathLength;
    knobs.jitter = settings.jitter;
  }
  if (settings.initialStepSize !== null) knobs.initialStepSize = settings.initialStepSize;
  return knobs;
}

/** Largest manifest accepted (bytes): starting positions can make it large, not larger. */
const maxManifestBytes = 256 * 1024 * 1024;

function describeIssue(issue: z.core.$ZodIssue, raw: unknown): string {
  if (issue.code === 'unrecognized_keys') return `unknown field ${issue.keys.map((k) => `\`${k}\``).join(', ')}`;
  const path = issue.path.map((k) => (typeof k === 'number' ? `[${k}]` : `.${String(k)}`)).join('').replace(/^\./, '');
  let value: unknown = raw;
  for (const k of issue.path) value = value !== null && typeof value === 'object' ? (value as Record<PropertyKey, unknown>)[k as string] : undefined;
  const shown = value === undefined ? 'missing' : JSON.stringify(value)?.slice(0, 80);
  return `field \`${path || '(root)'}\` = ${shown}: ${issue.message}`;
}

/**
 * Reads and validates the manifest of `folder` (untrusted input): zod-checked fields,
 * trace and checkpoint paths that stay inside the folder, consistent counts, and
 * sampler settings that this version resolves identically. Throws
 * {@link RunFolderError} for a missing, foreign, damaged or inconsistent folder.
 */
export function readManifest(folder: string): RunManifest {
  if (!existsSync(folder)) throw new RunFolderError(`run folder ${folder} does not exist`);
  if (!statSync(folder).isDirectory()) throw new RunFolderError(`${folder} is not a folder: expected a run folder`);
  const path = join(folder, manifestFile);
  if (!existsSync(path)) {
    throw new RunFolderError(`${folder} is not an apsis run folder: it has no ${manifestFile} (was the run started with a run folder, and is this the right path?)`);
  }
  if (lstatSync(path).isSymbolicLink()) throw new RunFolderError(`${folder}/${manifestFile} is a symbolic link; run folders may not contain links`);
  const size = statSync(path).size;
  if (size > maxManifestBytes) throw new RunFolderError(`${folder}/${manifestFile} is ${size} bytes: larger than any manifest apsis writes`);
  const text = readFileSync(path, 'utf8');
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    throw new RunFolderError(`${folder}/${manifestFile} is damaged or truncated (${size} bytes): ${(e as Error).message}`);
  }
  if (raw === null || typeof raw !== 'object' || Array.isArray(raw)) {
    throw new RunFolderError(`${folder}/${manifestFile} is not a run manifest: expected a JSON object`);
  }
  const r = raw as Record<string, unknown>;
  if (r.format !== runFolderFormat) {
    throw new RunFolderError(`${folder}/${manifestFile} is foreign: format ${JSON.stringify(r.format)}, expected ${JSON.stringify(runFolderFormat)}`);
  }
  if (r.version !== runFolderVersion) {
    throw new RunFolderError(
      `${folder}/${manifestFile} has format version ${JSON.stringify(r.version)}; this apsis reads version ${runFolderVersion}${typeof r.version === 'number' && r.version > runFolderVersion ? ' (the run was made by a newer apsis)' : ''}`,
    );
  }
  const parsed = manifestSchema.safeParse(raw);
  if (!parsed.success) throw new RunFolderError(`${folder}/${manifestFile}: ${describeIssue(parsed.error.issues[0], raw)}`);
  const m = parsed.data;
  const fail = (what: string): never => {
    throw new RunFolderError(`${folder}/${manifestFile}: ${what}`);
  };
  if (m.columns.coordinates.length !== m.dim) fail(`columns.coordinates has ${m.columns.coordinates.length} names: expected dim = ${m.dim}`);
  if (m.traces.length !== m.chains) fail(`traces lists ${m.traces.length} files: expected one per chain (chains = ${m.chains})`);
  if (m.init !== null) {
    if (m.init.length !== m.chains) fail(`init has ${m.init.length} positions: expected chains = ${m.chains}`);
    m.init.forEach((x, c) => x.length !== m.dim && fail(`init[${c}] has length ${x.length}: expected dim = ${m.dim}`));
  }
  m.traces.forEach((t, c) => resolveInside(folder, t, `${manifestFile} traces[${c}]`));
  if (new Set(m.traces).size !== m.traces.length) fail('traces lists the same file twice');
  if (m.checkpoints !== null) {
    m.checkpoints.slots.forEach((s, i) => resolveInside(folder, s, `${manifestFile} checkpoints.slots[${i}]`));
    if (m.checkpoints.slots[0] === m.checkpoints.slots[1]) fail('checkpoints.slots names one file twice');
    const all = [...m.traces, ...m.checkpoints.slots, manifestFile];
    if (new Set(all).size !== all.length) fail('a checkpoint file is also a trace file or the manifest');
  }
  if (m.traces.includes(manifestFile)) fail('a trace file is the manifest');
  let settings: ChainSettings;
  try {
    settings = resolveChainSettings(m.sampler as ChainSettingsInput, `${manifestFile} sampler`);
  } catch (e) {
    if (e instanceof SamplerOptionsError) fail(e.message);
    throw e;
  }
  if (JSON.stringify(settings!) !== JSON.stringify(m.settings)) {
    fail('the sampler settings recorded do not match what this version of apsis resolves from the recorded options (the run was made by a different version); it cannot be continued bit for bit');
  }
  for (const p of [m.traces, m.checkpoints?.slots ?? []].flat()) checkRelativePath(p, manifestFile);
  return { ...m, settings: settings!, sampler: m.sampler as ChainSettingsInput } as RunManifest;
}

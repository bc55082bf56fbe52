import { randomBytes } from 'node:crypto';
import { existsSync, lstatSync, mkdirSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { writeFileAtomic } from './atomicWrite.js';
import { RunFolderError } from './errors.js';
import { resolveInside } from './folderPaths.js';
import { manifestFile, type RunManifest } from './runManifest.js';
import { traceHeader } from './traceFormat.js';
import { openTraceWriter, type TraceWriter } from './traceWriter.js';

/** Trace file of chain `c` in a new run folder. */
export const traceFileName = (c: number): string => `traces/chain-${c}.csv`;
/** The two alternating checkpoint files of a new run folder. */
export const checkpointSlots: readonly [string, string] = ['checkpoints/slot-a.json', 'checkpoints/slot-b.json'];

/** A fresh random run id (32 hex digits). */
export function newRunId(): string {
  return randomBytes(16).toString('hex');
}

/**
 * Checks that `folder` can take a new run: missing (it will be created), or an empty
 * folder. Refuses a file, a symbolic link, or a folder that is not empty (which would
 * mix two runs). Creates nothing, so a run that fails to start leaves no trace.
 */
export function checkNewFolder(folder: string): void {
  if (!existsSync(folder)) return;
  if (lstatSync(folder).isSymbolicLink()) throw new RunFolderError(`run folder ${folder} is a symbolic link: expected a plain folder`);
  if (!statSync(folder).isDirectory()) throw new RunFolderError(`run folder ${folder} is a file: expected a folder (new or empty)`);
  const entries = readdirSync(folder);
  if (entries.length > 0) {
    const hint = entries.includes(manifestFile) ? ' It already holds a run: resume it, or choose a new folder.' : '';
    throw new RunFolderError(`run folder ${folder} is not empty (${entries.length} entries): expected a new or empty folder.${hint}`);
  }
}

/** Creates the folder (and its parents) and its `traces/` and `checkpoints/` sub-folders. */
export function createFolderLayout(folder: string): void {
  checkNewFolder(folder);
  mkdirSync(folder, { recursive: true });
  mkdirSync(join(folder, 'traces'));
  mkdirSync(join(folder, 'checkpoints'));
}

/** Writes the manifest (atomically). */
export function writeManifest(folder: string, manifest: RunManifest): void {
  writeFileAtomic(join(folder, manifestFile), JSON.stringify(manifest, null, 1) + '\n');
}

/** Versions of the software making a run, for the manifest. */
export function softwareVersions(): Record<string, string> {
  const out: Record<string, string> = { node: process.version };
  try {
    const pkg = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8')) as { name?: string; version?: string };
    if (pkg.name && pkg.version) out[pkg.name] = pkg.version;
  } catch {
    // version unknown
  }
  return out;
}

/** The header line of the manifest's trace files. */
export function manifestHeader(manifest: RunManifest): string {
  return traceHeader(manifest.columns.coordinates, manifest.columns.outputs);
}

/** Opens every chain's trace writer: new files, or files cut back to `resumeAt[c]`. */
export function openWriters(
  folder: string,
  manifest: RunManifest,
  resumeAt?: readonly { readonly bytes: number; readonly rows: number }[],
): TraceWriter[] {
  const header = manifestHeader(manifest);
  return manifest.traces.map((t, c) =>
    openTraceWriter(resolveInside(folder, t, `traces[${c}]`), header, manifest.dim, manifest.columns.outputs.length, resumeAt?.[c]),
  );
}

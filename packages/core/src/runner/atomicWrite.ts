import { closeSync, fsyncSync, openSync, renameSync, rmSync, writeSync } from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { randomBytes } from 'node:crypto';

/** Flushes a directory's entries (a completed rename) to disk; a no-op where unsupported. */
export function syncDirectory(dir: string): void {
  let fd: number | null = null;
  try {
    fd = openSync(dir, 'r');
    fsyncSync(fd);
  } catch {
    // Some platforms cannot open or fsync a directory; the rename is still atomic.
  } finally {
    if (fd !== null) closeSync(fd);
  }
}

/**
 * Replaces `path` with `data` so that a reader (or a crash at any instant) sees the
 * old file or the new one, never a mixture: writes a temporary file in the same
 * folder, fsyncs it, renames it over `path` and fsyncs the folder.
 */
export function writeFileAtomic(path: string, data: string | Uint8Array): void {
  const dir = dirname(path);
  const temp = join(dir, `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}.tmp`);
  const fd = openSync(temp, 'wx');
  try {
    const bytes = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
    let at = 0;
    while (at < bytes.length) at += writeSync(fd, bytes, at, bytes.length - at);
    fsyncSync(fd);
  } catch (e) {
    closeSync(fd);
    rmSync(temp, { force: true });
    throw e;
  }
  closeSync(fd);
  try {
    renameSync(temp, path);
  } catch (e) {
    rmSync(temp, { force: true });
    throw e;
  }
  syncDirectory(dir);
}

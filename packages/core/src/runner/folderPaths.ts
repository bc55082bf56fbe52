import { existsSync, lstatSync, realpathSync } from 'node:fs';
import { isAbsolute, join, relative, resolve, sep, win32 } from 'node:path';
import { RunFolderError } from './errors.js';

/**
 * Checks a path taken from a run folder's files: relative, forward slashes only, no
 * `.` or `..` segment, no empty segment, no NUL or backslash, at most 255 characters.
 * Returns its segments. Throws {@link RunFolderError} naming the field.
 */
export function checkRelativePath(path: unknown, field: string): string[] {
  if (typeof path !== 'string' || path.length === 0 || path.length > 255) {
    throw new RunFolderError(`${field} = ${JSON.stringify(path)}: expected a relative path of 1 to 255 characters`);
  }
  if (isAbsolute(path) || win32.isAbsolute(path) || path.includes('\\') || path.includes('\0') || /^[a-zA-Z]:/.test(path)) {
    throw new RunFolderError(`${field} = ${JSON.stringify(path)}: absolute paths are not allowed; expected a path inside the run folder`);
  }
  const segments = path.split('/');
  for (const s of segments) {
    if (s === '..' || s === '.' || s === '') {
      throw new RunFolderError(`${field} = ${JSON.stringify(path)}: segment ${JSON.stringify(s)} is not allowed; expected a plain path inside the run folder`);
    }
  }
  return segments;
}

/**
 * The absolute location of `path` inside `folder`, after {@link checkRelativePath}.
 * When the location (or a folder on the way) exists, it must not be a symbolic link
 * and its real path must stay inside the folder's real path.
 */
export function resolveInside(folder: string, path: unknown, field: string): string {
  const segments = checkRelativePath(path, field);
  const root = realpathSync(folder);
  let at = root;
  for (const s of segments) {
    at = join(at, s);
    if (!existsSync(at)) break;
    if (lstatSync(at).isSymbolicLink()) {
      throw new RunFolderError(`${field} = ${JSON.stringify(path)}: ${JSON.stringify(relative(root, at))} is a symbolic link; run folders may not contain links`);
    }
  }
  const full = resolve(root, ...segments);
  if (existsSync(full)) {
    const real = realpathSync(full);
    if (real !== root && !real.startsWith(root + sep)) {
      throw new RunFolderError(`${field} = ${JSON.stringify(path)}: resolves to ${real}, outside the run folder ${root}`);
    }
  }
  return full;
}

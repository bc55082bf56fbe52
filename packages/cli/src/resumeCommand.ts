import { isAbsolute, resolve } from 'node:path';
import { readManifest, recipeForResume, resumeRun } from '@apsis/core';
import { CliUsageError } from './cliErrors.js';
import { exitStatus, type CliIo } from './cliIo.js';
import { helpText } from './helpText.js';
import { numberOption, parseCommandLine } from './parseCommandLine.js';

/** A module named on the command line: a path (made absolute) or a package specifier. */
export function moduleFromCommandLine(value: string, cwd: string): string {
  if (value.startsWith('file:')) return value;
  if (isAbsolute(value) || value.startsWith('.') || /\.(m|c)?(j|t)sx?$/.test(value)) return resolve(cwd, value);
  return value;
}

/** `apsis resume <run folder> [--module PATH] [--export NAME] [--threads N] [--quiet]`. */
export async function resumeCommand(args: readonly string[], io: CliIo): Promise<number> {
  const { folder, values } = parseCommandLine('resume', args, {
    module: { type: 'string' },
    export: { type: 'string' },
    threads: { type: 'string' },
    quiet: { type: 'boolean' },
  });
  if (folder === null) {
    io.stdout.write(helpText.resume);
    return exitStatus.ok;
  }
  const threads = numberOption('resume', 'threads', values.threads, (x) => Number.isInteger(x) && x >= 0 && x <= 256, 'an integer from 0 to 256');
  if (values.export !== undefined && !/^[A-Za-z_$][A-Za-z0-9_$]*$/.test(String(values.export))) {
    throw new CliUsageError(`apsis resume: --export ${JSON.stringify(values.export)}: expected the name of an export (a JavaScript identifier)`);
  }
  const path = resolve(io.cwd, folder);
  const manifest = readManifest(path);
  const module = typeof values.module === 'string' ? moduleFromCommandLine(values.module, io.cwd) : null;
  const recipe = recipeForResume(manifest.recipe, module, typeof values.export === 'string' ? values.export : null);
  const result = await resumeRun(path, {
    target: recipe,
    ...(threads !== undefined ? { threads } : {}),
    ...(values.quiet === true ? { progress: false } : {}),
    ...(io.signal ? { signal: io.signal } : {}),
  });
  const lines = [`${path}: ${result.stop.message}`];
  for (const n of result.notes) lines.push(`  note: ${n}`);
  for (const f of result.stop.failures.slice(0, 10)) lines.push(`  not converged: ${f}`);
  lines.push(`next: apsis summary ${folder}`);
  io.stdout.write(lines.join('\n') + '\n');
  return exitStatus.ok;
}

import { resolve } from 'node:path';
import { readRun } from '@apsis/core';
import { writeReport } from '@apsis/report';
import { CliUsageError } from './cliErrors.js';
import { exitStatus, type CliIo } from './cliIo.js';
import { helpText } from './helpText.js';
import { parseCommandLine } from './parseCommandLine.js';
import { reportInputFromRun } from './reportInputFromRun.js';
import { runDiagnostics } from './runDiagnostics.js';

/** `apsis report <run folder> [--out DIR] [--title TEXT]`. */
export async function reportCommand(args: readonly string[], io: CliIo): Promise<number> {
  const { folder, values } = parseCommandLine('report', args, { out: { type: 'string' }, title: { type: 'string' } });
  if (folder === null) {
    io.stdout.write(helpText.report);
    return exitStatus.ok;
  }
  const path = resolve(io.cwd, folder);
  const run = readRun(path);
  const d = runDiagnostics(run, { all: false, strict: false, thresholds: {} });
  if (d.table === null) throw new CliUsageError(`apsis report: ${d.tooFew}`);
  const out = typeof values.out === 'string' ? resolve(io.cwd, values.out) : path;
  const file = await writeReport(reportInputFromRun(run, path, d.verdict!.warnings, typeof values.title === 'string' ? values.title : undefined), out);
  io.stdout.write(`wrote ${file}\n`);
  return exitStatus.ok;
}

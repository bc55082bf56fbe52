import { readFileSync } from 'node:fs';
import { CheckpointError, RunFolderError, RunOptionsError, TargetMismatchError, TargetRecipeError, WorkerFailureError } from '@apsis/core';
import { CliUsageError } from './cliErrors.js';
import { exitStatus, type CliIo } from './cliIo.js';
import { helpText } from './helpText.js';
import { reportCommand } from './reportCommand.js';
import { resumeCommand } from './resumeCommand.js';
import { summaryCommand } from './summaryCommand.js';

function version(): string {
  try {
    return (JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string }).version;
  } catch {
    return 'unknown';
  }
}

/** Errors that are the user's or the folder's, reported in one line without a stack. */
const expected = [CliUsageError, RunFolderError, CheckpointError, RunOptionsError, TargetRecipeError, TargetMismatchError, WorkerFailureError];

/**
 * Runs `apsis` with `args` (without the node and script paths) and resolves to the
 * exit status (see `exitStatus`). Never throws: errors are written to `io.stderr`.
 */
export async function runCli(args: readonly string[], io: CliIo): Promise<number> {
  const [command, ...rest] = args;
  try {
    switch (command) {
      case undefined:
      case '--help':
      case '-h':
      case 'help':
        io.stdout.write(helpText.main);
        return command === undefined ? exitStatus.error : exitStatus.ok;
      case '--version':
      case '-v':
        io.stdout.write(`apsis ${version()}\n`);
        return exitStatus.ok;
      case 'summary':
        return summaryCommand(rest, io);
      case 'resume':
        return await resumeCommand(rest, io);
      case 'report':
        return await reportCommand(rest, io);
      default:
        throw new CliUsageError(`apsis: unknown command ${JSON.stringify(command)}; commands: summary, resume, report (see apsis --help)`);
    }
  } catch (e) {
    if (io.signal?.aborted && e === io.signal.reason) {
      io.stderr.write('apsis: interrupted; the run folder is left as it was at the last checkpoint and can be resumed\n');
      return exitStatus.interrupted;
    }
    const err = e instanceof Error ? e : new Error(String(e));
    const known = expected.some((K) => err instanceof K);
    io.stderr.write(`apsis: ${known ? '' : `${err.name}: `}${err.message}\n`);
    if (!known && io.env.APSIS_DEBUG === '1' && err.stack) io.stderr.write(err.stack + '\n');
    return exitStatus.error;
  }
}

import { parseArgs } from 'node:util';
import { CliUsageError } from './cliErrors.js';

/** Option kinds of one command. */
export type OptionSpec = Record<string, { type: 'string' | 'boolean' }>;

/**
 * Parses a command's arguments: exactly one positional (the run folder) and the
 * given options. Throws {@link CliUsageError} naming the unknown option or the
 * missing argument.
 */
export function parseCommandLine(command: string, args: readonly string[], options: OptionSpec): { folder: string | null; values: Record<string, string | boolean | undefined> } {
  let parsed;
  try {
    parsed = parseArgs({ args: [...args], options: { ...options, help: { type: 'boolean', short: 'h' } }, allowPositionals: true, strict: true });
  } catch (e) {
    throw new CliUsageError(`apsis ${command}: ${(e as Error).message.replace(/\. To specify a positional argument.*$/s, '')}; see apsis ${command} --help`);
  }
  const values = parsed.values as Record<string, string | boolean | undefined>;
  if (values.help) return { folder: null, values };
  if (parsed.positionals.length !== 1) {
    throw new CliUsageError(
      `apsis ${command}: expected one run folder, got ${parsed.positionals.length === 0 ? 'none' : parsed.positionals.map((p) => JSON.stringify(p)).join(' ')}; see apsis ${command} --help`,
    );
  }
  return { folder: parsed.positionals[0], values };
}

/** A numeric option's value; throws {@link CliUsageError} when it is not a number in range. */
export function numberOption(command: string, name: string, value: string | boolean | undefined, check: (x: number) => boolean, expected: string): number | undefined {
  if (value === undefined) return undefined;
  const x = Number(value);
  if (typeof value !== 'string' || value.trim() === '' || !Number.isFinite(x) || !check(x)) {
    throw new CliUsageError(`apsis ${command}: --${name} ${JSON.stringify(value)}: expected ${expected}`);
  }
  return x;
}

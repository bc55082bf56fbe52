/** The command line was used wrongly: unknown command or option, missing or bad argument. */
export class CliUsageError extends Error {
  override readonly name = 'CliUsageError';
}

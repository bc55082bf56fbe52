/**
 * Error classes of the diagnostics package: one class per kind of misuse.
 * Every message names the field, the value found and what was expected.
 */

/** Base class of every error thrown by `@apsis/diagnostics`. */
export class DiagnosticsError extends Error {
  /** Path of the offending input, e.g. `chains[2]` or `options.quantiles[0]`. */
  readonly field: string;
  constructor(field: string, message: string) {
    super(message);
    this.name = new.target.name;
    this.field = field;
  }
}

/** The chains argument does not have the expected shape (not a list of numeric arrays, empty, ...). */
export class ChainShapeError extends DiagnosticsError {}

/** A draw is NaN or infinite. */
export class NonFiniteDrawError extends DiagnosticsError {
  /** Index of the chain holding the bad draw. */
  readonly chain: number;
  /** Index of the bad draw inside its chain. */
  readonly draw: number;
  constructor(field: string, chain: number, draw: number, value: number) {
    super(field, `${field}[${chain}][${draw}]: expected a finite number, got ${String(value)}`);
    this.chain = chain;
    this.draw = draw;
  }
}

/** Too few draws for split chains (each split half needs at least 4 draws). */
export class TooFewDrawsError extends DiagnosticsError {}

/** An option (quantile levels, thresholds, sizes) is out of range. */
export class OptionError extends DiagnosticsError {}

/** Per-draw sampler statistics have the wrong shape or contents. */
export class SamplerStatsError extends DiagnosticsError {}

/** The running (incremental) diagnostics state was used inconsistently. */
export class RunningStateError extends DiagnosticsError {}

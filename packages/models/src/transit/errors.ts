/**
 * Error classes of the transit module, one per kind of misuse. Each keeps the field it
 * is about, the offending value and what was expected, so callers can react without
 * parsing the message.
 */

function describe(value: unknown): string {
  if (typeof value === 'number') return Number.isNaN(value) ? 'NaN' : String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === undefined) return 'undefined';
  if (value === null) return 'null';
  if (Array.isArray(value)) return `an array of length ${value.length}`;
  if (ArrayBuffer.isView(value)) {
    return `a ${value.constructor.name} of length ${(value as unknown as ArrayLike<number>).length}`;
  }
  return typeof value === 'object' ? 'an object' : String(value);
}

/**
 * A scalar argument of a transit function is outside its domain: a negative
 * separation, a non-positive radius ratio, an impact parameter the orbit cannot
 * reach, limb-darkening coefficients with a non-positive total flux, ...
 */
export class TransitParameterError extends RangeError {
  override readonly name = 'TransitParameterError';
  constructor(
    readonly field: string,
    readonly value: unknown,
    readonly expected: string,
  ) {
    super(`${field} = ${describe(value)}: expected ${expected}`);
  }
}

/**
 * Light-curve data or a workspace option is malformed: mismatched lengths, non-finite
 * times, non-positive errors or exposure times, a sub-sample count that is not a
 * positive integer. `row` is the 0-based data row where one applies.
 */
export class LightCurveDataError extends Error {
  override readonly name = 'LightCurveDataError';
  constructor(
    readonly field: string,
    readonly row: number | undefined,
    readonly value: unknown,
    readonly expected: string,
  ) {
    super(`${row === undefined ? field : `${field}[${row}]`} = ${describe(value)}: expected ${expected}`);
  }
}

/**
 * An array handed to a light-curve kernel does not fit its workspace: a parameter
 * vector, weight vector or output buffer of the wrong length.
 */
export class TransitWorkspaceError extends Error {
  override readonly name = 'TransitWorkspaceError';
  constructor(
    readonly field: string,
    readonly value: unknown,
    readonly expected: string,
  ) {
    super(`${field} = ${describe(value)}: expected ${expected}`);
  }
}

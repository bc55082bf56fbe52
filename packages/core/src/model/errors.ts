/**
 * Error classes of the modelling layer, one per kind of misuse. Each carries the
 * field it is about, so callers can react without parsing messages.
 */

function describe(value: unknown): string {
  if (typeof value === 'number') return Number.isNaN(value) ? 'NaN' : String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === undefined) return 'undefined';
  if (value === null) return 'null';
  if (Array.isArray(value)) return `an array of length ${value.length}`;
  if (ArrayBuffer.isView(value)) return `a ${value.constructor.name} of length ${(value as unknown as ArrayLike<number>).length}`;
  if (typeof value === 'function') return 'a function';
  return typeof value === 'object' ? 'an object' : String(value);
}

function format(field: string, value: unknown, expected: string): string {
  return `${field} = ${describe(value)}: expected ${expected}`;
}

/** Arguments of a support (bijection) are invalid, e.g. `interval(2, 1)`. */
export class SupportArgumentError extends Error {
  override readonly name = 'SupportArgumentError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string) {
    super(format(field, value, expected));
  }
}

/** Arguments of a prior distribution are invalid, e.g. `normal(0, -1)`. */
export class PriorArgumentError extends Error {
  override readonly name = 'PriorArgumentError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string) {
    super(format(field, value, expected));
  }
}

/**
 * A model declaration is invalid: duplicate or malformed parameter names, a prior
 * that does not cover its parameter's support, a derived quantity clashing with a
 * parameter, a likelihood of the wrong shape.
 */
export class ModelDeclarationError extends Error {
  override readonly name = 'ModelDeclarationError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string) {
    super(format(field, value, expected));
  }
}

/** Data handed to a model are invalid: non-finite numbers, mismatched lengths. */
export class ModelDataError extends Error {
  override readonly name = 'ModelDataError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string, readonly row?: number) {
    super(row === undefined ? format(field, value, expected) : format(`${field}[${row}]`, value, expected));
  }
}

/**
 * Named parameter values handed to the model (initial values, values to transform)
 * are invalid: unknown or missing names, wrong lengths, values outside the support.
 */
export class ParameterValueError extends Error {
  override readonly name = 'ParameterValueError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string) {
    super(format(field, value, expected));
  }
}

/** Options of the posterior mode finder are invalid. */
export class ModeSearchOptionsError extends Error {
  override readonly name = 'ModeSearchOptionsError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string) {
    super(format(field, value, expected));
  }
}

export { describe as describeValue };

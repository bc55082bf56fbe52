/**
 * Error classes of the model builders, one per kind of misuse. Each keeps the field it
 * is about (a path such as `rv.errors` or `lightCurves[1].flux`), the 0-based row where
 * one applies, the offending value and what was expected.
 */

function describe(value: unknown): string {
  if (typeof value === 'number') return Number.isNaN(value) ? 'NaN' : String(value);
  if (typeof value === 'string') return JSON.stringify(value);
  if (value === undefined) return 'undefined';
  if (value === null) return 'null';
  if (Array.isArray(value)) return `an array of length ${value.length}`;
  if (ArrayBuffer.isView(value)) return `a ${value.constructor.name} of length ${(value as unknown as ArrayLike<number>).length}`;
  if (typeof value === 'function') return 'a function';
  if (typeof value === 'boolean') return String(value);
  return typeof value === 'object' ? 'an object' : String(value);
}

/**
 * Data handed to a model builder are malformed: a non-finite time or value, a
 * non-positive error or exposure time, an unknown instrument label, columns of
 * different lengths, fewer points than parameters. The message names the row and field,
 * e.g. `rv.errors[17] = 0: expected a finite positive number (m/s)`.
 */
export class FitDataError extends Error {
  override readonly name = 'FitDataError';
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
 * The model description is malformed: a bad planet or star entry, an unknown parameter
 * name in `priors` or `fixed`, a prior that does not suit its parameter, an unknown
 * option. The message names the field, e.g. `priors.period_x = ...: expected one of ...`.
 */
export class FitSettingsError extends Error {
  override readonly name = 'FitSettingsError';
  constructor(
    readonly field: string,
    readonly value: unknown,
    readonly expected: string,
  ) {
    super(`${field} = ${describe(value)}: expected ${expected}`);
  }
}

/** `['rv', 'errors', 17]` → `rv.errors[17]`. */
export function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) {
    if (typeof p === 'number') out += `[${p}]`;
    else out += out === '' ? String(p) : `.${String(p)}`;
  }
  return out;
}

/**
 * Raised when an orbit or radial-velocity function receives a number outside its
 * domain (a non-finite mean anomaly, an eccentricity outside [0, 1), a non-positive
 * period or mass, ...). The message names the argument, the value and what was
 * expected; the same three are kept as fields for programs that catch it.
 */
export class OrbitParameterError extends RangeError {
  readonly field: string;
  readonly value: unknown;
  readonly expected: string;

  constructor(field: string, value: unknown, expected: string) {
    super(`${field} = ${String(value)}: expected ${expected}`);
    this.name = 'OrbitParameterError';
    this.field = field;
    this.value = value;
    this.expected = expected;
  }
}

/**
 * Raised when radial-velocity data handed to a kernel are malformed (mismatched
 * lengths, non-finite values, non-positive errors, instrument indices out of range).
 * The message names the row (0-based) where one applies, the field and the value.
 */
export class RvDataError extends Error {
  readonly field: string;
  readonly row: number | undefined;
  readonly value: unknown;

  constructor(field: string, row: number | undefined, value: unknown, expected: string) {
    const where = row === undefined ? field : `${field}[${row}]`;
    super(`${where} = ${String(value)}: expected ${expected}`);
    this.name = 'RvDataError';
    this.field = field;
    this.row = row;
    this.value = value;
  }
}

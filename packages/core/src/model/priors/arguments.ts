import { z } from 'zod';
import { PriorArgumentError } from '../errors.js';

const finiteNumber = z.number();
const positiveNumber = z.number().positive();

/** Validates a finite number (zod rejects NaN and ±∞ by default). */
export function finiteArgument(field: string, value: unknown): number {
  const r = finiteNumber.safeParse(value);
  if (!r.success) throw new PriorArgumentError(field, value, 'a finite number');
  return r.data;
}

/** Validates a finite number > 0. */
export function positiveArgument(field: string, value: unknown): number {
  const r = positiveNumber.safeParse(value);
  if (!r.success) throw new PriorArgumentError(field, value, 'a finite number > 0');
  return r.data;
}

/** Validates a number or ±∞ (not NaN). */
export function boundArgument(field: string, value: unknown): number {
  if (typeof value !== 'number' || Number.isNaN(value)) {
    throw new PriorArgumentError(field, value, 'a number (±Infinity allowed)');
  }
  return value;
}

/** Validates lower < upper. */
export function orderedBounds(prior: string, lower: number, upper: number): void {
  if (!(lower < upper)) {
    throw new PriorArgumentError(`${prior}.upper`, upper, `a number greater than ${prior}.lower = ${lower}`);
  }
}

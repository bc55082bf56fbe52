/**
 * zod schemas for the scalar arguments of the public transit functions, and the one
 * helper that turns a failed parse into a {@link TransitParameterError} naming the
 * field, the value and what was expected. Hot kernels skip these checks; they are
 * applied once where data and options enter (workspaces, public scalar functions).
 */
import { z } from 'zod';
import { TransitParameterError } from './errors.js';

/** A schema and the plain-words description used in error messages. */
export interface ScalarRule {
  schema: z.ZodType<number>;
  expected: string;
}

export const finiteRule: ScalarRule = { schema: z.number(), expected: 'a finite number' };
export const nonNegativeRule: ScalarRule = { schema: z.number().nonnegative(), expected: 'a finite number >= 0' };
export const positiveRule: ScalarRule = { schema: z.number().positive(), expected: 'a finite number > 0' };
export const eccentricityRule: ScalarRule = {
  schema: z.number().nonnegative().lt(1),
  expected: 'an eccentricity in [0, 1)',
};
export const unitIntervalRule: ScalarRule = { schema: z.number().min(0).max(1), expected: 'a number in [0, 1]' };
export const scaledSemiMajorAxisRule: ScalarRule = {
  schema: z.number().gt(1),
  expected: 'a scaled semi-major axis a/R_* > 1',
};
export const inclinationRule: ScalarRule = {
  schema: z.number().gt(0).lt(Math.PI),
  expected: 'an inclination in (0, pi) radians',
};

/** Parses `value` with `rule`; throws TransitParameterError(field, value, expected). */
export function checkScalar(rule: ScalarRule, value: unknown, field: string): number {
  const result = rule.schema.safeParse(value);
  if (!result.success) throw new TransitParameterError(field, value, rule.expected);
  return result.data;
}

/**
 * Priors as the builders accept them: a prior object from `priors` of `@apsis/core`
 * (`priors.normal(3.2, 0.01)`), or the same as plain JSON, one key naming the
 * distribution and an array of its arguments (`{ "normal": [3.2, 0.01] }`), so that a
 * whole model description can cross into a worker thread or a run folder.
 */
import { isVectorPrior, priors, type Prior, type ScalarPrior } from '@apsis/core';
import { FitSettingsError } from './errors.js';

/** A prior object, or `{ distribution: [arguments…] }` with a distribution of `priors`. */
export type PriorInput = Prior | { readonly [distribution: string]: readonly number[] };

const JSON_PRIORS = [
  'normal',
  'halfNormal',
  'studentT',
  'cauchy',
  'halfCauchy',
  'uniform',
  'logUniform',
  'logNormal',
  'exponential',
  'gamma',
  'inverseGamma',
  'beta',
  'truncatedNormal',
] as const;

function isPriorObject(v: unknown): v is Prior {
  return v !== null && typeof v === 'object' && typeof (v as Prior).logDensity === 'function';
}

/** Resolves a {@link PriorInput} to a scalar prior; errors name `field`. */
export function resolveScalarPrior(input: unknown, field: string): ScalarPrior {
  if (isPriorObject(input)) {
    if (isVectorPrior(input)) throw new FitSettingsError(field, input.description, 'a prior on one number (not a vector prior)');
    return input;
  }
  const expected = `a prior from \`priors\` or { name: [arguments] } with name one of ${JSON_PRIORS.join(', ')}`;
  if (input === null || typeof input !== 'object' || Array.isArray(input)) throw new FitSettingsError(field, input, expected);
  const keys = Object.keys(input);
  if (keys.length !== 1) throw new FitSettingsError(field, input, expected);
  const name = keys[0] as (typeof JSON_PRIORS)[number];
  if (!JSON_PRIORS.includes(name)) throw new FitSettingsError(`${field}.${keys[0]}`, keys[0], expected);
  const args = (input as Record<string, unknown>)[name];
  if (!Array.isArray(args) || !args.every((a) => typeof a === 'number')) {
    throw new FitSettingsError(`${field}.${name}`, args, 'an array of numbers (the distribution\'s arguments)');
  }
  const make = priors[name] as (...a: number[]) => ScalarPrior;
  try {
    return make(...(args as number[]));
  } catch (e) {
    throw new FitSettingsError(`${field}.${name}`, args, (e as Error).message);
  }
}

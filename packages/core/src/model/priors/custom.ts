import { z } from 'zod';
import { PriorArgumentError } from '../errors.js';
import { boundArgument } from './arguments.js';
import type { RandomSource, ScalarPrior } from './prior.js';

/** A user's own prior, given by its log-density. */
export interface CustomPriorSpec {
  /** ln p(x); should be normalised if the model's evidence or prior draws matter. */
  readonly logDensity: (x: number) => number;
  /**
   * d ln p / dx. When omitted, a central difference with step 1e-5 · max(1, |x|) is
   * used: two extra density evaluations per element per call, and about 1e-9 relative
   * error in the derivative.
   */
  readonly derivative?: (x: number) => number;
  /** Lower end of the support (default −∞). */
  readonly lower?: number;
  /** Upper end of the support (default +∞). */
  readonly upper?: number;
  /** Set when the density is a proper density on the circle (−π, π], for angles. */
  readonly circular?: boolean;
  /** Draws one value; enables prior sampling for parameters using this prior. */
  readonly sample?: (source: RandomSource) => number;
  /** Shown in descriptions (default `custom`). */
  readonly label?: string;
}

const specSchema = z.object({
  logDensity: z.custom<(x: number) => number>((f) => typeof f === 'function', 'a function'),
  derivative: z.custom<(x: number) => number>((f) => typeof f === 'function', 'a function').optional(),
  circular: z.boolean().optional(),
  sample: z.custom<(s: RandomSource) => number>((f) => typeof f === 'function', 'a function').optional(),
  label: z.string().optional(),
});

/** A prior from a user-supplied log-density (and optionally its derivative). */
export function customPrior(spec: CustomPriorSpec): ScalarPrior {
  const r = specSchema.safeParse(spec);
  if (!r.success) {
    const issue = r.error.issues[0];
    const key = issue.path.join('.');
    const value = key === '' ? spec : (spec as unknown as Record<string, unknown>)[String(issue.path[0])];
    throw new PriorArgumentError(key === '' ? 'customPrior' : `customPrior.${key}`, value, issue.message);
  }
  const lo = spec.lower === undefined ? -Infinity : boundArgument('customPrior.lower', spec.lower);
  const hi = spec.upper === undefined ? Infinity : boundArgument('customPrior.upper', spec.upper);
  if (!(lo < hi)) throw new PriorArgumentError('customPrior.upper', hi, `a number greater than customPrior.lower = ${lo}`);
  const f = spec.logDensity;
  const derivative =
    spec.derivative ??
    ((x: number) => {
      const h = 1e-5 * Math.max(1, Math.abs(x));
      return (f(x + h) - f(x - h)) / (2 * h);
    });
  const prior: ScalarPrior = {
    kind: 'custom',
    description: spec.label ?? 'custom',
    lower: lo,
    upper: hi,
    proper: true,
    circular: spec.circular ?? false,
    logDensity: (x) => (x >= lo && x <= hi ? f(x) : -Infinity),
    logDensityDerivative: (x) => (x >= lo && x <= hi ? derivative(x) : 0),
    ...(spec.sample ? { sample: spec.sample } : {}),
  };
  return prior;
}

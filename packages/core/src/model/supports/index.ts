export type { Support, SupportKind, Transform } from './transform.js';
export type { AngleOptions } from './angle.js';
import { angle } from './angle.js';
import { interval, lowerBounded, positive, unitInterval, upperBounded } from './bounded.js';
import { ordered } from './ordered.js';
import { real } from './real.js';
import { simplex } from './simplex.js';

/**
 * Supports of parameters, each with its bijection to the unconstrained space:
 * `real()`, `positive()`, `lowerBounded(lower)`, `upperBounded(upper)`,
 * `interval(lower, upper)`, `unitInterval()`, `ordered()`, `angle()`, `simplex()`.
 */
export const supports = {
  real,
  positive,
  lowerBounded,
  upperBounded,
  interval,
  unitInterval,
  ordered,
  angle,
  simplex,
} as const;

export type { Support, SupportKind, Transform } from './transform.js';
export type { AngleOptions } from './angle.js';
import { angle } from './angle.js';
import { interval, lowerBounded, positive, unitInterval, upperBounded } from './bounded.js';
import { ordered } from './ordered.js';
import { real } from './real.js';
import { simplex } from './simplex.js';
import { unitDisk } from './unitDisk.js';

/**
 * Supports of parameters, each with its bijection to the unconstrained space:
 * `real()`, `positive()`, `lowerBounded(lower)`, `upperBounded(upper)`,
 * `interval(lower, upper)`, `unitInterval()`, `ordered()`, `angle()`, `simplex()`,
 * `unitDisk(radius?)` (2-vectors inside a disk, e.g. (√e cos ω, √e sin ω)).
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
  unitDisk,
} as const;

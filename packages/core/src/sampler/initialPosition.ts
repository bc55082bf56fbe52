import type { RandomStream } from '../random/index.js';
import type { Target } from '../target.js';
import { InitialisationError } from './errors.js';

/** Random starts tried before giving up. */
export const maxInitialisationAttempts = 100;

function allFinite(x: Float64Array): boolean {
  for (let i = 0; i < x.length; i++) if (!Number.isFinite(x[i])) return false;
  return true;
}

/**
 * Finds a starting point with finite log-density and gradient and writes it into
 * `position` / `gradient`; returns its log-density.
 *
 * With `init`, that position is used as given (it must have `target.dim` finite
 * entries and a finite density there). Without, positions are drawn uniformly in
 * (−2, 2) in every unconstrained coordinate from `rng`, up to 100 times.
 * Throws {@link InitialisationError} when no start works.
 */
export function findInitialPosition(
  target: Target,
  rng: RandomStream,
  chain: number,
  position: Float64Array,
  gradient: Float64Array,
  init?: ArrayLike<number>,
): number {
  const dim = target.dim;
  if (init !== undefined) {
    if (init.length !== dim) {
      throw new InitialisationError(
        `chain ${chain}: init has length ${init.length}: expected target.dim = ${dim}`,
      );
    }
    for (let i = 0; i < dim; i++) {
      if (!Number.isFinite(init[i])) {
        throw new InitialisationError(`chain ${chain}: init[${i}] = ${init[i]}: expected a finite number`);
      }
      position[i] = init[i];
    }
    const lp = target.logDensityGrad(position, gradient);
    if (!Number.isFinite(lp) || !allFinite(gradient)) {
      throw new InitialisationError(
        `chain ${chain}: at the given init the log-density is ${lp}` +
          (Number.isFinite(lp) ? ' but the gradient has a non-finite entry' : '') +
          ': expected a finite log-density and gradient; choose a start inside the support',
      );
    }
    return lp;
  }
  let last = NaN;
  for (let attempt = 0; attempt < maxInitialisationAttempts; attempt++) {
    for (let i = 0; i < dim; i++) position[i] = -2 + 4 * rng.uniform();
    const lp = target.logDensityGrad(position, gradient);
    if (Number.isFinite(lp) && allFinite(gradient)) return lp;
    last = lp;
  }
  throw new InitialisationError(
    `chain ${chain}: no finite log-density and gradient at ${maxInitialisationAttempts} random starts ` +
      `uniform in (-2, 2) (last log-density: ${last}); check the target's support or pass \`init\``,
  );
}

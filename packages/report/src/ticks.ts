/**
 * Axis ticks at "nice" numbers (1, 2 or 5 times a power of ten), after the
 * labelling algorithm of Heckbert (1990, "Nice numbers for graph labels",
 * Graphics Gems I, pp. 61-63). Ticks are placed inside the given domain only
 * (tight labelling), so a plot's frame is the data's own range.
 */

/**
 * The nice number closest to x (round = true) or the smallest nice number not
 * below x (round = false), following Heckbert (1990).
 */
export function niceNumber(x: number, round: boolean): number {
  if (!(x > 0) || !Number.isFinite(x)) throw new RangeError(`niceNumber: x must be a positive finite number, got ${x}`);
  const exponent = Math.floor(Math.log10(x));
  const fraction = x / 10 ** exponent;
  let nice: number;
  if (round) nice = fraction < 1.5 ? 1 : fraction < 3 ? 2 : fraction < 7 ? 5 : 10;
  else nice = fraction <= 1 ? 1 : fraction <= 2 ? 2 : fraction <= 5 ? 5 : 10;
  return nice * 10 ** exponent;
}

export interface Ticks {
  /** Tick positions, in the data's units, increasing. */
  values: number[];
  /** Spacing between ticks, a nice number. */
  step: number;
}

/**
 * Ticks at multiples of a nice step inside [min, max], aiming at about `target`
 * ticks. The step is Heckbert's rounded nice number of range / (target − 1);
 * Heckbert first rounds the range itself up to a nice number, which for tight
 * labelling often halves the tick count, so that step is left out here.
 */
export function niceTicks(min: number, max: number, target = 5): Ticks {
  if (!Number.isFinite(min) || !Number.isFinite(max) || !(max > min)) {
    throw new RangeError(`niceTicks: need finite min < max, got [${min}, ${max}]`);
  }
  const wanted = Math.max(2, Math.round(target));
  let step = niceNumber((max - min) / (wanted - 1), true);
  let values = ticksAt(min, max, step);
  // A tight domain can hold a single multiple of the step; take the next smaller
  // nice step until at least two ticks fall inside.
  while (values.length < 2) {
    step = smallerNice(step);
    values = ticksAt(min, max, step);
  }
  return { values, step };
}

function ticksAt(min: number, max: number, step: number): number[] {
  const first = Math.ceil(min / step - 1e-9);
  const last = Math.floor(max / step + 1e-9);
  const values: number[] = [];
  for (let k = first; k <= last; k++) values.push(Number((k * step).toPrecision(12)));
  return values;
}

/** The next nice number below a nice number: 10 → 5 → 2 → 1 → 0.5 … */
function smallerNice(step: number): number {
  const exponent = Math.floor(Math.log10(step) + 1e-9);
  const fraction = Math.round(step / 10 ** exponent);
  const next = fraction === 5 ? 2 : fraction === 2 ? 1 : 0.5;
  return Number((next * 10 ** exponent).toPrecision(12));
}

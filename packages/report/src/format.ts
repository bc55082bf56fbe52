/**
 * Number formatting for tick labels and tables. Negative numbers use the
 * typographic minus sign (U+2212) so columns line up and read as numbers.
 */

const MINUS = '\u2212';

function withMinus(text: string): string {
  return text.startsWith('-') ? MINUS + text.slice(1) : text;
}

/** Decimal places that show a quantity to the resolution of `step`. */
function decimalsFor(step: number): number {
  return Math.max(0, Math.ceil(-Math.log10(step) - 1e-9));
}

/** Label for a tick at `value` among ticks spaced `step` apart, fixed-point. */
export function formatTick(value: number, step: number): string {
  if (Math.abs(value) < step * 1e-9) return '0';
  return withMinus(value.toFixed(Math.min(decimalsFor(step), 15)));
}

export interface TickLabels {
  labels: string[];
  /**
   * A round number subtracted from every tick before labelling, or 0. Taken when
   * the ticks would otherwise need many leading digits (for example a period of
   * 3.2000012 days known to 1e-6 days); the axis title then says "− offset".
   */
  offset: number;
  /** The offset as written in the axis title ('' when there is none). */
  offsetText: string;
  /**
   * A power of ten (a multiple of 3) that the labels are expressed in, or 0:
   * labels 0.5, 1.0 with exponent −6 mean 0.5e−6 and 1.0e−6. Taken when the
   * labels would be very small (step below 1e−3) or very large (≥ 1e5).
   */
  exponent: number;
}

/**
 * Labels for a set of nice ticks: fixed-point, relative to a round offset when
 * the spacing is tiny compared with the values, and in a common power of ten
 * when they are very small or very large.
 */
export function tickLabels(values: number[], step: number): TickLabels {
  if (values.length === 0) return { labels: [], offset: 0, offsetText: '', exponent: 0 };
  let offset = 0;
  let offsetText = '';
  const largest = Math.max(...values.map(Math.abs));
  if (largest > 0 && step / largest < 1e-4) {
    // The roundest number that leaves every label within 100 steps of it; at
    // each rounding, an offset at or below all ticks (labels ≥ 0) is preferred,
    // else the nearest: 3.2 for ticks 3.199998 … 3.200014 spaced 2e-6.
    const lo = values[0];
    const mid = (values[0] + values[values.length - 1]) / 2;
    const fits = (c: number) => values.every((v) => Math.abs(v - c) <= 100 * step);
    for (let q = Math.ceil(Math.log10(largest)); q > Math.log10(step) - 1; q--) {
      const unit = 10 ** q;
      const below = Math.floor(lo / unit) * unit;
      const nearest = Math.round(mid / unit) * unit;
      const pick = fits(below) ? below : fits(nearest) ? nearest : undefined;
      if (pick !== undefined) {
        offset = Number(pick.toPrecision(15));
        break;
      }
    }
    offsetText = offset === 0 ? '' : withMinus(offset.toString());
  }
  const shifted = values.map((v) => Number((v - offset).toPrecision(12)));
  const biggest = Math.max(...shifted.map(Math.abs));
  let exponent = 0;
  if (step < 1e-3 || biggest >= 1e5) {
    exponent = 3 * Math.floor(Math.log10(Math.max(biggest, step)) / 3);
  }
  const factor = 10 ** exponent;
  const labels = shifted.map((v) => formatTick(Number((v / factor).toPrecision(12)), step / factor));
  return { labels, offset, offsetText, exponent };
}

const SUPERSCRIPT: Record<string, string> = {
  '0': '\u2070', '1': '\u00b9', '2': '\u00b2', '3': '\u00b3', '4': '\u2074',
  '5': '\u2075', '6': '\u2076', '7': '\u2077', '8': '\u2078', '9': '\u2079', '-': '\u207b',
};

/** "×10⁻⁶" for exponent −6. */
export function powerOfTen(exponent: number): string {
  const digits = String(exponent).split('').map((c) => SUPERSCRIPT[c] ?? c).join('');
  return `\u00d710${digits}`;
}

/**
 * A value shown to the resolution of an uncertainty `scale` (two significant
 * digits of the scale; common practice for reporting estimates with errors).
 */
export function formatToScale(value: number | undefined, scale: number | undefined): string {
  if (value === undefined || !Number.isFinite(value)) return '\u2014';
  if (scale === undefined || !(scale > 0) || !Number.isFinite(scale)) return formatSignificant(value, 4);
  const decimals = Math.max(0, 1 - Math.floor(Math.log10(scale)));
  const magnitude = Math.abs(value);
  if (magnitude >= 1e7 || (magnitude > 0 && magnitude < 1e-4 && decimals > 8)) {
    const digits = Math.max(1, Math.floor(Math.log10(Math.max(magnitude, scale))) - Math.floor(Math.log10(scale)) + 1);
    return withMinus(value.toExponential(Math.min(digits, 14)));
  }
  return withMinus(value.toFixed(Math.min(decimals, 14)));
}

/** A value to `digits` significant digits (trailing zeros kept), exponent notation for extremes. */
export function formatSignificant(value: number | undefined, digits = 3): string {
  if (value === undefined || !Number.isFinite(value)) return '\u2014';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e6 || magnitude < 1e-3) return withMinus(value.toExponential(digits - 1));
  if (magnitude >= 10 ** digits) return withMinus(Math.round(value).toString());
  return withMinus(value.toPrecision(digits));
}

/** A count or effective sample size, rounded to an integer. */
export function formatCount(value: number | undefined): string {
  if (value === undefined || !Number.isFinite(value)) return '\u2014';
  return withMinus(Math.round(value).toString());
}

/** A fixed number of decimals (R-hat: 3, acceptance: 2). */
export function formatFixed(value: number | undefined, decimals: number): string {
  if (value === undefined || !Number.isFinite(value)) return '\u2014';
  const text = value.toFixed(decimals);
  return Number(text) === 0 ? text.replace('-', '') : withMinus(text);
}

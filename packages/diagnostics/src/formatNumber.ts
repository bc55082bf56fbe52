/**
 * Number formatting for the text table: enough decimals to resolve the quantity's
 * spread (two significant digits of the sd), never NaN.
 */

/** Decimals that show two significant digits of `scale` (0..12). */
export function decimalsFor(scale: number): number {
  if (!(scale > 0) || !Number.isFinite(scale)) return 4;
  return Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(scale))));
}

/** A value shown with `decimals` decimals; exponent form for very large or tiny magnitudes. */
export function formatFixed(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return 'undefined';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e9 || (magnitude > 0 && magnitude < 1e-6 && decimals >= 10)) return value.toExponential(3);
  return value.toFixed(decimals);
}

/** Two significant digits (for Monte Carlo errors). */
export function formatSignificant(value: number, digits = 2): string {
  if (!Number.isFinite(value)) return 'undefined';
  if (value === 0) return '0';
  const magnitude = Math.abs(value);
  if (magnitude >= 1e9 || magnitude < 1e-6) return value.toExponential(digits - 1);
  const decimals = Math.max(0, digits - 1 - Math.floor(Math.log10(magnitude)));
  return value.toFixed(decimals);
}

/** A probability as a percent label: 0.05 -> "5%", 0.025 -> "2.5%". */
export function percentLabel(probability: number): string {
  return `${Number((100 * probability).toPrecision(6))}%`;
}

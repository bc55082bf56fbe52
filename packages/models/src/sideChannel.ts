/**
 * The float64 side channel of the TensorFlow.js ops (DESIGN.md, numerics policy): an op
 * runs on the exact float64 values of its parameters, after checking that they still
 * stand for the float32 tensor it was given (a stale or misaligned array is refused).
 */

/** Largest allowed |exact - tensor| / max(1, |exact|). */
export const SIDE_CHANNEL_TOLERANCE = 1e-4;

/** Index of the first element of `exact` that does not match `tensorValues`, or -1. */
export function sideChannelMismatch(exact: ArrayLike<number>, tensorValues: ArrayLike<number>): number {
  for (let i = 0; i < exact.length; i++) {
    const x = exact[i];
    if (!(Math.abs(x - tensorValues[i]) <= SIDE_CHANNEL_TOLERANCE * Math.max(1, Math.abs(x)))) return i;
  }
  return -1;
}

/**
 * A small in-place radix-2 fast Fourier transform (iterative Cooley–Tukey, decimation in
 * time: bit-reversal permutation, then log2(n) stages of butterflies). Complex numbers are
 * held as two parallel Float64Arrays (real and imaginary parts).
 *
 * Forward transform: X_k = sum_t x_t exp(-2 pi i k t / n). The inverse uses the conjugate
 * twiddles and divides by n. Plans cache the twiddle factors and the bit-reversal table so
 * repeated transforms of one size cost no trigonometric calls.
 *
 * Reference: Cooley & Tukey (1965), Mathematics of Computation 19, 297.
 */

/** Precomputed tables for transforms of one power-of-two size. */
export interface FftPlan {
  /** Transform length, a power of two ≥ 1. */
  readonly size: number;
  /** cos(2 pi k / n), k < n/2. */
  readonly cos: Float64Array;
  /** sin(2 pi k / n), k < n/2. */
  readonly sin: Float64Array;
  /** Bit-reversed index of every position. */
  readonly reversed: Uint32Array;
}

/** Smallest power of two that is ≥ `n` (and ≥ 1). */
export function nextPowerOfTwo(n: number): number {
  let p = 1;
  while (p < n) p *= 2;
  return p;
}

/** Builds the tables for transforms of length `size` (a power of two). */
export function createFftPlan(size: number): FftPlan {
  if (!Number.isInteger(size) || size < 1 || (size & (size - 1)) !== 0) {
    throw new RangeError(`size: expected a power of two ≥ 1, got ${size}`);
  }
  const half = size >> 1;
  const cos = new Float64Array(half);
  const sin = new Float64Array(half);
  for (let k = 0; k < half; k++) {
    const angle = (2 * Math.PI * k) / size;
    cos[k] = Math.cos(angle);
    sin[k] = Math.sin(angle);
  }
  const reversed = new Uint32Array(size);
  let bits = 0;
  while (1 << bits < size) bits++;
  for (let i = 0; i < size; i++) {
    let r = 0;
    for (let b = 0, v = i; b < bits; b++, v >>= 1) r = (r << 1) | (v & 1);
    reversed[i] = r;
  }
  return { size, cos, sin, reversed };
}

/**
 * Transforms `re` + i `im` in place (both of length `plan.size`).
 * @param inverse when true computes the inverse transform, including the 1/n factor
 */
export function fftInPlace(plan: FftPlan, re: Float64Array, im: Float64Array, inverse = false): void {
  const n = plan.size;
  const { cos, sin, reversed } = plan;
  for (let i = 0; i < n; i++) {
    const j = reversed[i];
    if (j > i) {
      const tr = re[i];
      re[i] = re[j];
      re[j] = tr;
      const ti = im[i];
      im[i] = im[j];
      im[j] = ti;
    }
  }
  // Forward uses exp(-i angle) = cos - i sin; inverse uses cos + i sin.
  const sign = inverse ? 1 : -1;
  for (let size = 2; size <= n; size <<= 1) {
    const half = size >> 1;
    const stride = n / size;
    for (let start = 0; start < n; start += size) {
      for (let j = 0, k = 0; j < half; j++, k += stride) {
        const wr = cos[k];
        const wi = sign * sin[k];
        const a = start + j;
        const b = a + half;
        const br = re[b];
        const bi = im[b];
        const tr = wr * br - wi * bi;
        const ti = wr * bi + wi * br;
        re[b] = re[a] - tr;
        im[b] = im[a] - ti;
        re[a] += tr;
        im[a] += ti;
      }
    }
  }
  if (inverse) {
    const scale = 1 / n;
    for (let i = 0; i < n; i++) {
      re[i] *= scale;
      im[i] *= scale;
    }
  }
}

/**
 * Stable ascending argsort of float64 values by least-significant-digit radix sort on their
 * bit patterns (four passes of 16-bit digits), O(S) instead of O(S log S) comparisons.
 *
 * IEEE 754 doubles order like unsigned 64-bit integers once negative numbers have all bits
 * flipped and non-negative numbers have the sign bit flipped (Knuth, The Art of Computer
 * Programming vol. 3, sec. 5.2.5, for LSD radix sorting; the sign trick is common practice).
 * -0 sorts just before +0; they compare equal, so tie handling is unaffected.
 * Short inputs (below RADIX_MIN_LENGTH) are sorted by comparing values instead.
 */

/** Reusable buffers for sorting up to `capacity` values. */
export interface RadixSortBuffers {
  readonly capacity: number;
  readonly hiA: Uint32Array;
  readonly loA: Uint32Array;
  readonly idxA: Uint32Array;
  readonly hiB: Uint32Array;
  readonly loB: Uint32Array;
  readonly idxB: Uint32Array;
  /** Digit histograms, allocated on the first radix sort (small inputs never need them). */
  counts: Uint32Array | null;
}

/** Below this length a comparison sort of indices is cheaper than four 65536-bucket passes. */
export const RADIX_MIN_LENGTH = 8192;

export function createRadixSortBuffers(capacity: number): RadixSortBuffers {
  return {
    capacity,
    hiA: new Uint32Array(capacity),
    loA: new Uint32Array(capacity),
    idxA: new Uint32Array(capacity),
    hiB: new Uint32Array(capacity),
    loB: new Uint32Array(capacity),
    idxB: new Uint32Array(capacity),
    counts: null,
  };
}

const LITTLE_ENDIAN = new Uint8Array(new Uint16Array([1]).buffer)[0] === 1;

/**
 * Writes into `order` the permutation that sorts `values` ascending (order[0] indexes the
 * smallest), and the sorted values into `sorted`. Values must not be NaN.
 */
export function radixArgsort(values: Float64Array, order: Uint32Array, sorted: Float64Array, buffers: RadixSortBuffers): void {
  const n = values.length;
  if (n > buffers.capacity) throw new RangeError(`values: length ${n} exceeds the sort buffers' capacity ${buffers.capacity}`);
  if (n < RADIX_MIN_LENGTH) {
    for (let i = 0; i < n; i++) order[i] = i;
    order.subarray(0, n).sort((a, b) => values[a] - values[b]);
    for (let i = 0; i < n; i++) sorted[i] = values[order[i]];
    return;
  }
  const words = new Uint32Array(values.buffer, values.byteOffset, 2 * n);
  const loOff = LITTLE_ENDIAN ? 0 : 1;
  const hiOff = 1 - loOff;
  if (buffers.counts === null) buffers.counts = new Uint32Array(4 * 65536);
  const counts = buffers.counts;
  counts.fill(0);
  // Histogram pass: the four 16-bit digits of every transformed key.
  for (let i = 0; i < n; i++) {
    let h = words[2 * i + hiOff];
    let l = words[2 * i + loOff];
    if (h & 0x80000000) {
      h = ~h >>> 0;
      l = ~l >>> 0;
    } else {
      h = (h | 0x80000000) >>> 0;
    }
    counts[l & 0xffff]++;
    counts[65536 + (l >>> 16)]++;
    counts[131072 + (h & 0xffff)]++;
    counts[196608 + (h >>> 16)]++;
  }
  const skip = [false, false, false, false];
  for (let pass = 0; pass < 4; pass++) {
    const base = pass * 65536;
    let total = 0;
    for (let d = 0; d < 65536; d++) {
      const c = counts[base + d];
      if (c === n) skip[pass] = true; // every key shares this digit: the pass would not move anything
      counts[base + d] = total;
      total += c;
    }
  }
  // Pass 1 (low 16 bits of the low word) reads the keys straight from the values; later
  // passes carry only what the remaining passes need: after pass 2 the low word is dropped,
  // and the last pass moves the indices alone.
  let hi = buffers.hiA;
  let lo = buffers.loA;
  let idx = buffers.idxA;
  let hi2 = buffers.hiB;
  let lo2 = buffers.loB;
  let idx2 = buffers.idxB;
  for (let i = 0; i < n; i++) {
    let h = words[2 * i + hiOff];
    let l = words[2 * i + loOff];
    if (h & 0x80000000) {
      h = ~h >>> 0;
      l = ~l >>> 0;
    } else {
      h = (h | 0x80000000) >>> 0;
    }
    const at = skip[0] ? i : counts[l & 0xffff]++;
    hi[at] = h;
    lo[at] = l;
    idx[at] = i;
  }
  if (!skip[1]) {
    for (let i = 0; i < n; i++) {
      const at = counts[65536 + (lo[i] >>> 16)]++;
      hi2[at] = hi[i];
      idx2[at] = idx[i];
    }
    let t = hi;
    hi = hi2;
    hi2 = t;
    t = idx;
    idx = idx2;
    idx2 = t;
    t = lo;
    lo = lo2;
    lo2 = t;
  }
  if (!skip[2]) {
    for (let i = 0; i < n; i++) {
      const at = counts[131072 + (hi[i] & 0xffff)]++;
      hi2[at] = hi[i];
      idx2[at] = idx[i];
    }
    let t = hi;
    hi = hi2;
    hi2 = t;
    t = idx;
    idx = idx2;
    idx2 = t;
  }
  if (!skip[3]) {
    for (let i = 0; i < n; i++) order[counts[196608 + (hi[i] >>> 16)]++] = idx[i];
  } else {
    for (let i = 0; i < n; i++) order[i] = idx[i];
  }
  for (let i = 0; i < n; i++) sorted[i] = values[order[i]];
}

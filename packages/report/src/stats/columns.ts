/** Reading one quantity out of row-major draws. */

/** Column `j` of a row-major draws × dim array, as a new Float64Array. */
export function column(draws: ArrayLike<number>, dim: number, j: number): Float64Array {
  const rows = Math.floor(draws.length / dim);
  const out = new Float64Array(rows);
  for (let r = 0; r < rows; r++) out[r] = draws[r * dim + j];
  return out;
}

/** Column `j` of every chain. */
export function columnOfChains(chains: readonly ArrayLike<number>[], dim: number, j: number): Float64Array[] {
  return chains.map((c) => column(c, dim, j));
}

/** All chains one after the other. */
export function pool(chains: readonly ArrayLike<number>[]): Float64Array {
  let n = 0;
  for (const c of chains) n += c.length;
  const out = new Float64Array(n);
  let at = 0;
  for (const c of chains) {
    out.set(c, at);
    at += c.length;
  }
  return out;
}

/** A divergence flag array (numbers or booleans) as 0/1 bytes; all zero when absent. */
export function flags(source: ArrayLike<number> | boolean[] | undefined, length: number): Uint8Array {
  const out = new Uint8Array(length);
  if (!source) return out;
  for (let i = 0; i < length && i < source.length; i++) out[i] = source[i] ? 1 : 0;
  return out;
}

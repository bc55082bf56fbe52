/**
 * Split chains (Vehtari et al. 2021; Gelman et al., Bayesian Data Analysis, 3rd
 * ed., sec. 11.4): each chain of N draws becomes two halves of floor(N/2) draws; for odd N
 * the middle draw is left out. Halves are views (no copies) into a pooled, chain-major
 * buffer holding M chains of N draws each.
 */
export function splitHalves(pooled: Float64Array, chains: number, draws: number): Float64Array[] {
  const half = Math.floor(draws / 2);
  const out: Float64Array[] = [];
  for (let m = 0; m < chains; m++) {
    const start = m * draws;
    out.push(pooled.subarray(start, start + half), pooled.subarray(start + draws - half, start + draws));
  }
  return out;
}

/** Copies equal-length chains into one chain-major buffer (`out`, or a new one). */
export function poolChains(chains: readonly Float64Array[], out?: Float64Array): Float64Array {
  const draws = chains.length === 0 ? 0 : chains[0].length;
  const pooled = out ?? new Float64Array(chains.length * draws);
  for (let m = 0; m < chains.length; m++) pooled.set(chains[m], m * draws);
  return pooled;
}

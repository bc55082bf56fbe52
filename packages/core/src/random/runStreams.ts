import { createRandomStream, type RandomStream } from './randomStream.js';

/**
 * The seed text of chain `chain` in a run seeded by `seed`. Distinct (seed, chain)
 * pairs give distinct texts, which xor4096's string seeding mixes into unrelated
 * initial states (Brent 2010).
 */
export function chainSeedText(seed: number, chain: number): string {
  if (!Number.isSafeInteger(seed)) {
    throw new RangeError(`seed = ${String(seed)}: expected a safe integer`);
  }
  if (!Number.isInteger(chain) || chain < 0) {
    throw new RangeError(`chain = ${String(chain)}: expected an integer >= 0`);
  }
  return `apsis run ${seed} chain ${chain}`;
}

/** The independent random stream of one chain, derived from the run seed. */
export function createChainStream(seed: number, chain: number): RandomStream {
  return createRandomStream(chainSeedText(seed, chain));
}

/** One independent stream per chain (index 0 … chains − 1) derived from the run seed. */
export function createRunStreams(seed: number, chains: number): RandomStream[] {
  if (!Number.isInteger(chains) || chains < 1) {
    throw new RangeError(`chains = ${String(chains)}: expected an integer >= 1`);
  }
  return Array.from({ length: chains }, (_, chain) => createChainStream(seed, chain));
}

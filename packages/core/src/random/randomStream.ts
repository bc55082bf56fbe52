import seedrandom from 'seedrandom';

/** Plain-JSON state of a {@link RandomStream}: enough to continue it bit for bit. */
export interface RandomStreamState {
  /** Generator family; only Brent's xor4096 (via seedrandom) is used. */
  readonly generator: 'xor4096';
  /** Index into the xorshift array. */
  readonly i: number;
  /** Weyl sequence value. */
  readonly w: number;
  /** The 128 signed 32-bit words of the xorshift array. */
  readonly X: readonly number[];
  /** Second normal deviate of the last polar-method pair, not yet handed out. */
  readonly spareNormal: number | null;
}

/**
 * A seeded stream of float64 random numbers. Stateful: every call advances it.
 * Use {@link RandomStream.getState} and {@link restoreRandomStream} to checkpoint.
 */
export interface RandomStream {
  /** Uniform on the open interval (0, 1) with 53 random bits. */
  uniform(): number;
  /** Standard normal deviate (Marsaglia polar method, float64). */
  normal(): number;
  /** Standard exponential deviate (rate 1), by inversion. */
  exponential(): number;
  /** A JSON-safe copy of the stream's state. */
  getState(): RandomStreamState;
}

interface Xor4096Internal {
  i: number;
  w: number;
  X: number[];
}

type Xor4096Prng = seedrandom.StatefulPRNG<Xor4096Internal>;

/**
 * A new stream seeded by `seedText` (seedrandom's xor4096, a 4096-bit xorshift
 * combined with a Weyl generator; Brent 2010, arXiv:1004.3115).
 */
export function createRandomStream(seedText: string): RandomStream {
  const prng = seedrandom.xor4096(seedText, { state: true }) as unknown as Xor4096Prng;
  return wrap(prng, null);
}

/** Continues a stream from a state produced by {@link RandomStream.getState}. */
export function restoreRandomStream(state: RandomStreamState): RandomStream {
  if (
    state === null ||
    typeof state !== 'object' ||
    state.generator !== 'xor4096' ||
    !Number.isInteger(state.i) ||
    !Number.isInteger(state.w) ||
    !Array.isArray(state.X) ||
    state.X.length !== 128 ||
    !state.X.every((x) => Number.isInteger(x))
  ) {
    throw new RandomStateError(
      `random stream state is invalid: expected { generator: 'xor4096', i, w, X: 128 integers, spareNormal }`,
    );
  }
  if (state.spareNormal !== null && !Number.isFinite(state.spareNormal)) {
    throw new RandomStateError(
      `random stream state field \`spareNormal\` = ${String(state.spareNormal)}: expected a finite number or null`,
    );
  }
  const internal: Xor4096Internal = { i: state.i, w: state.w, X: state.X.slice() };
  // seedrandom copies the given state into a fresh generator (the seed is then ignored).
  const prng = seedrandom.xor4096('', { state: internal as never }) as unknown as Xor4096Prng;
  return wrap(prng, state.spareNormal);
}

/** A random stream state that cannot be restored. */
export class RandomStateError extends Error {
  override readonly name = 'RandomStateError';
}

function wrap(prng: Xor4096Prng, spare: number | null): RandomStream {
  let spareNormal = spare;
  const uniform = (): number => prng.double();
  return {
    uniform,
    normal(): number {
      if (spareNormal !== null) {
        const z = spareNormal;
        spareNormal = null;
        return z;
      }
      // Marsaglia & Bray (1964) polar method: two deviates per accepted pair.
      let u: number;
      let v: number;
      let s: number;
      do {
        u = 2 * uniform() - 1;
        v = 2 * uniform() - 1;
        s = u * u + v * v;
      } while (s >= 1 || s === 0);
      const f = Math.sqrt((-2 * Math.log(s)) / s);
      spareNormal = v * f;
      return u * f;
    },
    exponential(): number {
      return -Math.log(uniform());
    },
    getState(): RandomStreamState {
      const g = prng.state();
      return { generator: 'xor4096', i: g.i, w: g.w, X: g.X.slice(), spareNormal };
    },
  };
}

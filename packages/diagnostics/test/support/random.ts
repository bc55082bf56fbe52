/**
 * Seeded test randomness: xoshiro128** (Blackman & Vigna 2018, "Scrambled linear
 * pseudorandom number generators", arXiv:1805.01407) seeded through splitmix32, 53-bit
 * uniforms from two outputs, normals by the Box–Muller transform (Box & Muller 1958,
 * Annals of Mathematical Statistics 29, 610).
 */
export interface TestRandom {
  /** Uniform on the open interval (0, 1). */
  uniform(): number;
  /** Standard normal. */
  normal(): number;
}

export function createRandom(seed: number): TestRandom {
  let x = seed >>> 0;
  const splitmix = (): number => {
    x = (x + 0x9e3779b9) >>> 0;
    let z = x;
    z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
    z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
    return (z ^ (z >>> 16)) >>> 0;
  };
  let s0 = splitmix();
  let s1 = splitmix();
  let s2 = splitmix();
  let s3 = splitmix();
  const next = (): number => {
    const result = Math.imul(((Math.imul(s1, 5) << 7) | (Math.imul(s1, 5) >>> 25)) >>> 0, 9) >>> 0;
    const t = (s1 << 9) >>> 0;
    s2 ^= s0;
    s3 ^= s1;
    s1 ^= s2;
    s0 ^= s3;
    s2 ^= t;
    s3 = ((s3 << 11) | (s3 >>> 21)) >>> 0;
    s0 >>>= 0;
    s1 >>>= 0;
    s2 >>>= 0;
    return result;
  };
  const uniform = (): number => {
    const hi = next() >>> 5; // 27 bits
    const lo = next() >>> 6; // 26 bits
    return (hi * 67108864 + lo + 0.5) / 9007199254740992;
  };
  let spare: number | null = null;
  const normal = (): number => {
    if (spare !== null) {
      const v = spare;
      spare = null;
      return v;
    }
    const r = Math.sqrt(-2 * Math.log(uniform()));
    const a = 2 * Math.PI * uniform();
    spare = r * Math.sin(a);
    return r * Math.cos(a);
  };
  return { uniform, normal };
}

/**
 * Stationary Gaussian AR(1): x_t = phi x_{t-1} + sqrt(1 - phi^2) e_t, x_0 ~ N(0, 1), so the
 * marginal is N(0, 1) and the lag-t autocorrelation is phi^t.
 */
export function ar1Chain(rng: TestRandom, draws: number, phi: number): Float64Array {
  const out = new Float64Array(draws);
  const innovation = Math.sqrt(1 - phi * phi);
  let x = rng.normal();
  for (let t = 0; t < draws; t++) {
    if (t > 0) x = phi * x + innovation * rng.normal();
    out[t] = x;
  }
  return out;
}

/** Independent standard normal draws. */
export function normalDraws(rng: TestRandom, draws: number): Float64Array {
  const out = new Float64Array(draws);
  for (let i = 0; i < draws; i++) out[i] = rng.normal();
  return out;
}

/** Independent standard Cauchy draws, tan(pi (u - 1/2)). */
export function cauchyDraws(rng: TestRandom, draws: number): Float64Array {
  const out = new Float64Array(draws);
  for (let i = 0; i < draws; i++) out[i] = Math.tan(Math.PI * (rng.uniform() - 0.5));
  return out;
}

/** Several chains from one generator function. */
export function chainsOf(count: number, make: (chain: number) => Float64Array): Float64Array[] {
  return Array.from({ length: count }, (_, c) => make(c));
}

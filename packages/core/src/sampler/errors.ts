/** An option passed to a sampler entry point is missing, of the wrong type or out of range. */
export class SamplerOptionsError extends Error {
  override readonly name = 'SamplerOptionsError';
}

/** No starting point with a finite log-density and gradient could be found. */
export class InitialisationError extends Error {
  override readonly name = 'InitialisationError';
}

/** A chain state (live or serialised) is inconsistent with the target or settings. */
export class ChainStateError extends Error {
  override readonly name = 'ChainStateError';
}

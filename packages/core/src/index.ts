export type { Target, TargetOutputs } from './target.js';
export * from './random/index.js';
export * from './sampler/index.js';
export * from './model/index.js';
export * from './runner/index.js';

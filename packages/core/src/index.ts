export type { Target, TargetOutputs } from './target.js';

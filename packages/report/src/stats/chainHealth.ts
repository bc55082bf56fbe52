/** Per-chain sampler health figures for the sampler table and health plots. */
import type { ChainStats } from '../input.js';
import { energyBfmi } from '@apsis/diagnostics';

export interface ChainHealth {
  draws: number;
  /** Draws whose trajectory diverged (undefined: not recorded). */
  divergences?: number;
  /** Draws whose tree depth reached run.maxTreeDepth. */
  depthLimitHits?: number;
  maxTreeDepthSeen?: number;
  meanAcceptance?: number;
  /** Median step size over the draws (constant after warmup in most samplers). */
  stepSize?: number;
  meanLeapfrogSteps?: number;
  ebfmi?: number;
}

function mean(a: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i];
  return s / a.length;
}

function median(a: ArrayLike<number>): number {
  const s = Float64Array.from(a).sort();
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}

/** Health figures of one chain from its statistics. */
export function chainHealth(stats: ChainStats | undefined, draws: number, maxTreeDepth?: number): ChainHealth {
  const h: ChainHealth = { draws };
  if (!stats) return h;
  if (stats.divergent) {
    let d = 0;
    for (let i = 0; i < stats.divergent.length; i++) if (stats.divergent[i]) d++;
    h.divergences = d;
  }
  if (stats.treeDepth && stats.treeDepth.length > 0) {
    let mx = 0;
    let hits = 0;
    for (let i = 0; i < stats.treeDepth.length; i++) {
      const t = stats.treeDepth[i];
      if (t > mx) mx = t;
      if (maxTreeDepth !== undefined && t >= maxTreeDepth) hits++;
    }
    h.maxTreeDepthSeen = mx;
    if (maxTreeDepth !== undefined) h.depthLimitHits = hits;
  }
  if (stats.acceptance && stats.acceptance.length > 0) h.meanAcceptance = mean(stats.acceptance);
  if (stats.stepSize && stats.stepSize.length > 0) h.stepSize = median(stats.stepSize);
  if (stats.leapfrogSteps && stats.leapfrogSteps.length > 0) h.meanLeapfrogSteps = mean(stats.leapfrogSteps);
  if (stats.energy) {
    const e = energyBfmi(stats.energy);
    if (Number.isFinite(e)) h.ebfmi = e;
  }
  return h;
}

import { createNutsWorkspace, type NutsWorkspace } from './nuts.js';
import { createPhasePoint, type PhasePoint } from './phasePoint.js';
import { createHmcWorkspace, type HmcWorkspace } from './staticHmc.js';
import type { ChainSettings } from './chainSettings.js';

/**
 * Preallocated scratch memory for advancing one chain. Holds nothing that a
 * checkpoint needs: any workspace of the right size gives the same draws.
 */
export interface ChainWorkspace {
  readonly dim: number;
  readonly nuts: NutsWorkspace | null;
  readonly hmc: HmcWorkspace | null;
  /** Scratch for the step-size heuristic. */
  readonly start: PhasePoint;
  readonly trial: PhasePoint;
}

/** Scratch memory for a chain in `dim` dimensions run with `settings`. */
export function createChainWorkspace(dim: number, settings: ChainSettings): ChainWorkspace {
  return {
    dim,
    nuts: settings.method === 'nuts' ? createNutsWorkspace(dim, settings.maxTreeDepth) : null,
    hmc: settings.method === 'hmc' ? createHmcWorkspace(dim) : null,
    start: createPhasePoint(dim),
    trial: createPhasePoint(dim),
  };
}

import type { ChainSettings } from '../sampler/chainSettings.js';
import type { Target } from '../target.js';
import { createChainHost, type ChainStart, type SliceLimits } from './chainHost.js';
import type { ChainExecutor, EventSink } from './chainExecutor.js';

/** Runs every chain in the calling thread, taking turns slice by slice. */
export function createInThreadExecutor(
  target: Target,
  settings: ChainSettings,
  starts: readonly ChainStart[],
  sink: EventSink,
  slice?: SliceLimits,
): ChainExecutor {
  const host = createChainHost(target, settings, starts, sink, slice);
  return {
    dim: target.dim,
    names: target.names ? [...target.names] : null,
    outputNames: host.outputNames,
    threads: 0,
    moves: 0,
    async advance(request) {
      const standing = await host.advance(request);
      return standing.sort((a, b) => a.chain - b.chain);
    },
    stop: () => host.stop(),
    close: async () => host.stop(),
  };
}

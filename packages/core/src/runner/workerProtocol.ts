import type { ChainSettings } from '../sampler/chainSettings.js';
import type { ChainStart, ChainStanding, AdvanceRequest, HostEvent, ReleasedChain, SliceLimits } from './chainHost.js';
import type { ResolvedTargetRecipe } from './targetRecipe.js';

/** The data a chain worker starts with (its `workerData`). */
export interface WorkerSetup {
  readonly recipe: ResolvedTargetRecipe;
  readonly settings: ChainSettings;
  readonly starts: readonly ChainStart[];
  readonly slice: SliceLimits;
}

/** Messages from the controlling thread to a chain worker. */
export type ToWorker =
  | { readonly type: 'advance'; readonly request: AdvanceRequest }
  | { readonly type: 'stop' }
  | { readonly type: 'close' }
  /** Hand one chain over (see `ChainHost.release`); answered by `released`. */
  | { readonly type: 'release' }
  /** Host a chain released by another worker. */
  | { readonly type: 'adopt'; readonly start: ChainStart };

/** Messages from a chain worker to the controlling thread. */
export type FromWorker =
  | { readonly type: 'ready'; readonly dim: number; readonly names: readonly string[] | null; readonly outputNames: readonly string[] }
  | { readonly type: 'event'; readonly event: HostEvent }
  | { readonly type: 'reached'; readonly standing: ChainStanding[] }
  | { readonly type: 'released'; readonly released: ReleasedChain | null }
  | { readonly type: 'failed'; readonly name: string; readonly message: string; readonly stack?: string };

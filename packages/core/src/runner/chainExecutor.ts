import type { AdvanceRequest, ChainStanding, HostEvent } from './chainHost.js';

/**
 * Runs all chains of a run, in the calling thread or on worker threads, and reports
 * their events to one sink. Same chains, same draws, whichever executor runs them.
 */
export interface ChainExecutor {
  readonly dim: number;
  /** Coordinate names of the target, when it has them. */
  readonly names: readonly string[] | null;
  /** Output (constrained and derived) names; empty when the target has none. */
  readonly outputNames: readonly string[];
  /** Worker threads in use (0: the calling thread). */
  readonly threads: number;
  /** Chains handed from one worker thread to another so far, to even the load. */
  readonly moves: number;
  /** Advances every chain to `request.goal`; resolves with standings sorted by chain. */
  advance(request: AdvanceRequest): Promise<ChainStanding[]>;
  /** Asks all chains to stop after their current iteration. */
  stop(): void;
  /** Releases threads; the executor cannot be used afterwards. */
  close(): Promise<void>;
}

/** Receives every event of every chain, in order per chain. */
export type EventSink = (event: HostEvent) => void;

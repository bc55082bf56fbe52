import type { Worker } from 'node:worker_threads';
import type { ChainSettings } from '../sampler/chainSettings.js';
import { ChainStateError, InitialisationError } from '../sampler/errors.js';
import type { AdvanceRequest, ChainStanding, ChainStart, ReleasedChain, SliceLimits } from './chainHost.js';
import { defaultSliceLimits } from './chainHost.js';
import type { ChainExecutor, EventSink } from './chainExecutor.js';
import { TargetMismatchError, TargetRecipeError, WorkerFailureError } from './errors.js';
import type { ResolvedTargetRecipe } from './targetRecipe.js';
import { isTypeScriptModule, launchChainWorker } from './workerLaunch.js';
import type { FromWorker, ToWorker, WorkerSetup } from './workerProtocol.js';

interface Deferred<T> {
  resolve(value: T): void;
  reject(error: Error): void;
}

interface WorkerSlot {
  readonly index: number;
  readonly worker: Worker;
  readonly chains: number[];
  ready: Deferred<FromWorker & { type: 'ready' }> | null;
  advancing: Deferred<ChainStanding[]> | null;
  releasing: Deferred<ReleasedChain | null> | null;
  failure: Error | null;
  closing: boolean;
}

const errorClasses: Record<string, new (message: string) => Error> = {
  TargetMismatchError,
  TargetRecipeError,
  InitialisationError,
  ChainStateError,
};

function rebuildError(name: string, message: string, slot: WorkerSlot): Error {
  const Kind = errorClasses[name];
  if (Kind) return new Kind(message);
  return new WorkerFailureError(`worker ${slot.index} (chains ${slot.chains.join(', ')}) failed: ${name}: ${message}`);
}

/** Which worker runs each chain: chain c on worker c mod threads. */
export function assignChains(chains: readonly number[], threads: number): number[][] {
  const groups: number[][] = Array.from({ length: threads }, () => []);
  chains.forEach((c, i) => groups[i % threads].push(c));
  return groups.filter((g) => g.length > 0);
}

/**
 * Starts `threads` long-lived worker threads, each rebuilding the target from
 * `recipe` and hosting some of the chains (chain c on worker c mod threads), and
 * resolves once every worker has built its target. Rejects with the worker's own
 * error (TargetRecipeError, InitialisationError, TargetMismatchError, …) or
 * {@link WorkerFailureError}.
 */
export async function startWorkerExecutor(
  recipe: ResolvedTargetRecipe,
  settings: ChainSettings,
  starts: readonly ChainStart[],
  threads: number,
  sink: EventSink,
  slice: SliceLimits = defaultSliceLimits,
): Promise<ChainExecutor> {
  const byChain = new Map(starts.map((s) => [s.chain, s]));
  const groups = assignChains(starts.map((s) => s.chain), threads);
  const slots: WorkerSlot[] = groups.map((chains, index) => {
    const setup: WorkerSetup = { recipe, settings, starts: chains.map((c) => byChain.get(c)!), slice };
    const worker = launchChainWorker(setup, isTypeScriptModule(recipe.module));
    const slot: WorkerSlot = { index, worker, chains, ready: null, advancing: null, releasing: null, failure: null, closing: false };
    const failWith = (error: Error): void => {
      if (slot.failure === null) slot.failure = error;
      slot.ready?.reject(slot.failure);
      slot.advancing?.reject(slot.failure);
      slot.releasing?.reject(slot.failure);
      slot.ready = null;
      slot.advancing = null;
      slot.releasing = null;
    };
    worker.on('message', (message: FromWorker) => {
      switch (message.type) {
        case 'ready':
          slot.ready?.resolve(message);
          slot.ready = null;
          break;
        case 'event':
          sink(message.event);
          break;
        case 'reached':
          slot.advancing?.resolve(message.standing);
          slot.advancing = null;
          break;
        case 'released':
          slot.releasing?.resolve(message.released);
          slot.releasing = null;
          break;
        case 'failed':
          failWith(rebuildError(message.name, message.message, slot));
          break;
      }
    });
    worker.on('error', (e: Error) => failWith(new WorkerFailureError(`worker ${index} (chains ${chains.join(', ')}) crashed: ${e.message}`)));
    worker.on('exit', (code) => {
      if (!slot.closing) failWith(new WorkerFailureError(`worker ${index} (chains ${chains.join(', ')}) exited unexpectedly with code ${code}`));
    });
    return slot;
  });

  const post = (slot: WorkerSlot, message: ToWorker): void => slot.worker.postMessage(message);
  const closeAll = async (): Promise<void> => {
    await Promise.all(
      slots.map(async (slot) => {
        slot.closing = true;
        await slot.worker.terminate();
      }),
    );
  };

  let readies: (FromWorker & { type: 'ready' })[];
  try {
    readies = await Promise.all(
      slots.map(
        (slot) =>
          new Promise<FromWorker & { type: 'ready' }>((resolve, reject) => {
            if (slot.failure) reject(slot.failure);
            else slot.ready = { resolve, reject };
          }),
      ),
    );
  } catch (e) {
    await closeAll();
    throw e;
  }
  const first = readies[0];
  for (const r of readies) {
    if (r.dim !== first.dim || r.outputNames.length !== first.outputNames.length) {
      await closeAll();
      throw new WorkerFailureError(`workers built targets of different shapes (dim ${first.dim} and ${r.dim}): the recipe's factory is not deterministic`);
    }
  }

  /** Posts `advance` to one worker; resolves with its standings when it reaches the goal. */
  const advanceOne = (slot: WorkerSlot, request: AdvanceRequest): Promise<ChainStanding[]> =>
    new Promise<ChainStanding[]>((resolve, reject) => {
      if (slot.failure) return reject(slot.failure);
      slot.advancing = { resolve, reject };
      post(slot, { type: 'advance', request });
    });
  /** Asks a worker to hand over one chain; null when it keeps them all. */
  const releaseFrom = (slot: WorkerSlot): Promise<ReleasedChain | null> =>
    new Promise((resolve, reject) => {
      if (slot.failure) return reject(slot.failure);
      slot.releasing = { resolve, reject };
      post(slot, { type: 'release' });
    });
  let stopping = false;
  let moves = 0;

  /**
   * Runs one worker to the goal; each time it gets there while another worker still
   * has two or more chains short of it, it takes one of them over and runs on. Chains
   * do not depend on their host, so the draws are unchanged; the run ends when the
   * total work, not the busier worker's share, is done.
   */
  const advanceBalanced = async (slot: WorkerSlot, request: AdvanceRequest, standings: Map<number, ChainStanding>, running: Set<WorkerSlot>): Promise<void> => {
    for (;;) {
      const reached = advanceOne(slot, request);
      // A stop that came while a chain was moving here still applies to it: the worker
      // clears its stop flag when an advance starts, so the stop follows the advance.
      if (stopping) post(slot, { type: 'stop' });
      for (const s of await reached) standings.set(s.chain, s);
      running.delete(slot);
      if (stopping) return;
      let moved = false;
      // The busiest first: the worker hosting the most chains.
      for (const other of [...running].sort((a, b) => b.chains.length - a.chains.length)) {
        if (other.releasing !== null) continue; // another worker is asking it already
        const released = await releaseFrom(other);
        if (released === null) continue;
        other.chains.splice(other.chains.indexOf(released.chain), 1);
        slot.chains.push(released.chain);
        post(slot, { type: 'adopt', start: { chain: released.chain, restore: released.state } });
        moves += 1;
        moved = true;
        break;
      }
      if (!moved) return;
      running.add(slot);
    }
  };

  return {
    dim: first.dim,
    names: first.names,
    outputNames: first.outputNames,
    threads: slots.length,
    get moves() {
      return moves;
    },
    async advance(request) {
      stopping = false;
      const standings = new Map<number, ChainStanding>();
      const running = new Set(slots);
      await Promise.all(slots.map((slot) => advanceBalanced(slot, request, standings, running)));
      return [...standings.values()].sort((a, b) => a.chain - b.chain);
    },
    stop() {
      stopping = true;
      for (const slot of slots) if (slot.failure === null) post(slot, { type: 'stop' });
    },
    close: closeAll,
  };
}

/**
 * Entry of a chain worker thread: rebuilds the target from its recipe, hosts its
 * chains and answers `advance` requests with rows, snapshots, progress and standings.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { createChainHost, type ChainHost } from './chainHost.js';
import { loadRecipeTarget } from './targetRecipe.js';
import type { FromWorker, ToWorker, WorkerSetup } from './workerProtocol.js';

const port = parentPort;
if (port === null) throw new Error('chainWorker.ts must run in a worker thread');

const send = (message: FromWorker, transfer: ArrayBuffer[] = []): void => port.postMessage(message, transfer);

const fail = (e: unknown): void => {
  const err = e instanceof Error ? e : new Error(String(e));
  send({ type: 'failed', name: err.name, message: err.message, ...(err.stack ? { stack: err.stack } : {}) });
};

async function main(): Promise<void> {
  const setup = workerData as WorkerSetup;
  const target = await loadRecipeTarget(setup.recipe);
  const host: ChainHost = createChainHost(
    target,
    setup.settings,
    setup.starts,
    (event) => {
      const transfer = event.kind === 'rows' ? [event.block.draws.buffer, event.block.stats.buffer, event.block.outputs.buffer] : [];
      send({ type: 'event', event }, [...new Set(transfer)] as ArrayBuffer[]);
    },
    setup.slice,
  );
  let running: Promise<void> = Promise.resolve();
  port!.on('message', (message: ToWorker) => {
    if (message.type === 'advance') {
      running = running.then(() =>
        host.advance(message.request).then(
          (standing) => send({ type: 'reached', standing }),
          (e: unknown) => fail(e),
        ),
      );
    } else if (message.type === 'release') {
      // Answered at once: between two slices of a running advance, or while idle.
      send({ type: 'released', released: host.release() });
    } else if (message.type === 'adopt') {
      running = running.then(() => {
        try {
          host.adopt(message.start);
        } catch (e) {
          fail(e);
        }
      });
    } else if (message.type === 'stop') {
      host.stop();
    } else if (message.type === 'close') {
      host.stop();
      void running.then(() => port!.close());
    }
  });
  send({ type: 'ready', dim: target.dim, names: target.names ? [...target.names] : null, outputNames: host.outputNames });
}

main().catch(fail);

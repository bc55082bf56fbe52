/**
 * What two worker threads can gain over one on this machine for work that shares
 * nothing: a fixed arithmetic loop (no memory traffic, no allocation, no shared code
 * cache), done once as 2 units in one worker and once as 1 unit in each of two workers.
 * Its ratio is the ceiling any parallel-chains figure measured beside it can reach; on
 * a virtual machine whose two cores are not fully its own it is below 2 (measured here
 * 2026-12-01, 8 repeats of 2 × 3 s: 1.49 to 2.19, median 1.80).
 */
import { Worker } from 'node:worker_threads';

// Plain JavaScript run with `eval`, so that the worker needs no loader for TypeScript.
const loop = `
const { parentPort, workerData } = require('node:worker_threads');
let s = 0, x = 1.0001;
const t = performance.now();
for (let i = 0; i < workerData.iterations; i++) { x = x * 1.0000001 + Math.sin(i * 1e-3); s += Math.sqrt(Math.abs(x)); }
parentPort.postMessage({ ms: performance.now() - t, s });
`;

function inWorker(iterations: number): Promise<number> {
  return new Promise((resolve, reject) => {
    const w = new Worker(loop, { eval: true, workerData: { iterations } });
    w.once('message', (m: { ms: number; s: number }) => {
      if (!Number.isFinite(m.s)) reject(new Error('the arithmetic loop lost its value'));
      else resolve(m.ms / 1000);
      void w.terminate();
    });
    w.once('error', reject);
  });
}

/** Loop iterations that take about `seconds` in one worker on this machine. */
export async function calibrateIterations(seconds: number): Promise<number> {
  const trial = 2e7;
  const t = await inWorker(trial);
  return Math.max(1e6, Math.round((trial * seconds) / Math.max(t, 1e-3)));
}

/** One repeat: (one worker's time for 2 units) / (the slower of two workers doing 1 unit each). */
export async function ceilingRatio(iterations: number): Promise<number> {
  const serial = await inWorker(2 * iterations);
  const parallel = await Promise.all([inWorker(iterations), inWorker(iterations)]);
  return serial / Math.max(...parallel);
}

import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { HostEvent } from '../src/runner/chainHost.js';
import { createInThreadExecutor } from '../src/runner/inThreadExecutor.js';
import { resolveTargetRecipe } from '../src/runner/targetRecipe.js';
import { startWorkerExecutor } from '../src/runner/workerExecutor.js';
import { resolveChainSettings } from '../src/sampler/chainSettings.js';
import { gaussian } from './fixtures/targets.js';

// Reference: the calling thread's host. A chain depends only on (seed, chain index,
// settings) (DESIGN.md, "Same seed, same options: bit-identical draws"), so handing it
// from one worker to another in the middle of a run must not change a bit of its rows.
const fixtures = fileURLToPath(new URL('./fixtures/targets.ts', import.meta.url));
const args = { dim: 3, scale: 1.5, work: 3000 };
const settings = resolveChainSettings({ warmup: 200, draws: 200 });
const starts = [0, 1, 2].map((chain) => ({ chain, seed: 77 }));

/** Every row of every chain, in the order the sink received them, checked to be contiguous. */
function collector(): { sink: (e: HostEvent) => void; rows: Map<number, number[]> } {
  const rows = new Map<number, number[]>();
  return {
    rows,
    sink: (e) => {
      if (e.kind !== 'rows') return;
      const mine = rows.get(e.block.chain) ?? [];
      expect(e.block.first).toBe(mine.length / (args.dim + 7));
      for (let r = 0; r < e.block.count; r++) {
        mine.push(...e.block.draws.subarray(r * args.dim, (r + 1) * args.dim), ...e.block.stats.subarray(r * 7, (r + 1) * 7));
      }
      rows.set(e.block.chain, mine);
    },
  };
}

describe('load balancing between worker threads', () => {
  it('hands a chain to a worker that has finished, and the rows stay bit-identical', async () => {
    // Three chains on two workers: chain c starts on worker c mod 2, so worker 1 (one
    // chain) finishes while worker 0 still has two chains halfway, and takes one over.
    const moved = collector();
    const executor = await startWorkerExecutor(resolveTargetRecipe({ module: fixtures, exportName: 'gaussian', args }), settings, starts, 2, moved.sink, {
      iterations: 5,
      seconds: 10,
    });
    let standing;
    try {
      standing = await executor.advance({ goal: 400, snapshotEvery: 0, snapshotAtGoal: false });
      expect(executor.moves).toBeGreaterThanOrEqual(1);
    } finally {
      await executor.close();
    }
    const here = collector();
    const reference = createInThreadExecutor(gaussian(args), settings, starts, here.sink);
    const expected = await reference.advance({ goal: 400, snapshotEvery: 0, snapshotAtGoal: false });
    expect(standing).toEqual(expected);
    expect(standing.map((s) => s.iteration)).toEqual([400, 400, 400]);
    for (const chain of [0, 1, 2]) {
      expect(moved.rows.get(chain)!.length).toBe(400 * (args.dim + 7));
      expect(moved.rows.get(chain)).toEqual(here.rows.get(chain));
    }
  });
});

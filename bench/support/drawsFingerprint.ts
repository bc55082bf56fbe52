/**
 * A fingerprint of sampler output (draws and statistics, bit patterns) for a few fixed
 * runs: NUTS with unit, diagonal and dense metrics and static HMC, on a correlated
 * Gaussian. Kernel optimisations must leave it unchanged (bit-identical draws for the
 * same seed). Not timed.
 *
 * Run: npx tsx --conditions=source bench/support/drawsFingerprint.ts
 */
import { createHash } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import { runChains, type RunOptions } from '@apsis/core';
import { rotatedGaussian } from './gaussianTargets.js';

/** Hex digest over every draw and statistic of the runs below. */
export async function samplerFingerprint(): Promise<Record<string, string>> {
  const g = rotatedGaussian(12, 1e3, 'fingerprint');
  const runs: Record<string, RunOptions> = {
    'nuts-unit': { metric: 'unit', warmup: 150, draws: 150 },
    'nuts-diagonal': { metric: 'diagonal', warmup: 150, draws: 150 },
    'nuts-dense': { metric: 'dense', warmup: 300, draws: 150 },
    'nuts-depth3': { metric: 'diagonal', warmup: 100, draws: 100, maxTreeDepth: 3 },
    'hmc-jitter': { method: 'hmc', steps: 7, jitter: 0.2, warmup: 150, draws: 150 },
    'hmc-path': { method: 'hmc', metric: 'dense', pathLength: 2, warmup: 300, draws: 100 },
  };
  const out: Record<string, string> = {};
  for (const [name, options] of Object.entries(runs)) {
    const r = await runChains(g.target, { ...options, chains: 2, seed: 2024 });
    const h = createHash('sha256');
    for (let c = 0; c < r.draws.length; c++) {
      h.update(new Uint8Array(r.draws[c].buffer, r.draws[c].byteOffset, r.draws[c].byteLength));
      const s = r.stats[c];
      for (const col of [s.stepSize, s.treeDepth, s.leapfrogSteps, s.divergent, s.energy, s.acceptance, s.logDensity]) {
        h.update(new Uint8Array(col.buffer, col.byteOffset, col.byteLength));
      }
    }
    out[name] = h.digest('hex').slice(0, 16);
  }
  return out;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  console.log(JSON.stringify(await samplerFingerprint(), null, 1));
}

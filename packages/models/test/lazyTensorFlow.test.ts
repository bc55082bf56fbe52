/**
 * Importing @apsis/models must not load TensorFlow.js: a fused float64 model never uses
 * it, and its import costs about 0.5 s in every thread that builds a model (measured,
 * docs/performance.md). The first TensorFlow.js op loads it. Checked in a fresh Node
 * process, since this test process may have loaded it for other tests.
 */
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../../..');

const script = `
import { createRequire } from 'node:module';
const cache = createRequire(import.meta.url).cache;
const tensorFlowFiles = () => Object.keys(cache).filter((k) => k.includes('@tensorflow')).length;
const models = await import('@apsis/models');
const atImport = tensorFlowFiles();
const core = await import('@apsis/core');
const tf = core.requireTensorFlow();
const E = models.solveKeplerOp(tf.tensor1d([1]), tf.scalar(0.5)).dataSync()[0];
console.log(JSON.stringify({ atImport, afterOp: tensorFlowFiles(), E }));
`;

describe('lazy TensorFlow.js', () => {
  it('is not loaded by importing @apsis/models, and is by the first op', () => {
    const r = spawnSync(process.execPath, ['--conditions=source', '--import', 'tsx', '--input-type=module', '-e', script], { cwd: root, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    const out = JSON.parse(r.stdout.trim().split('\n').pop()!) as { atImport: number; afterOp: number; E: number };
    expect(out.atImport).toBe(0);
    expect(out.afterOp).toBeGreaterThan(0);
    // E − 0.5 sin E = 1 at E = 1.4987011 (Newton's method by hand, from memory; the float32 value).
    expect(out.E - 0.5 * Math.sin(out.E)).toBeCloseTo(1, 5);
  }, 60_000);
});

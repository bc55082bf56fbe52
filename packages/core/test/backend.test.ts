import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { afterEach, describe, expect, it, vi } from 'vitest';
import { BackendSelectionError, DEFAULT_BACKEND, resetNativeProbe, selectBackend } from '../src/tensorflow/index.js';
import { loadTensorFlow } from '../src/tensorflow/loadTensorFlow.js';
import { compileModel, priors, tensorLikelihood } from '../src/model/index.js';

const here = path.dirname(fileURLToPath(import.meta.url));
const root = path.resolve(here, '../../..');

afterEach(() => {
  delete process.env.APSIS_BACKEND;
  resetNativeProbe();
});

describe('backend selection', () => {
  it('prints one line on stderr, once per process', async () => {
    const writes: string[] = [];
    const spy = vi.spyOn(process.stderr, 'write').mockImplementation((s: string | Uint8Array) => {
      writes.push(String(s));
      return true;
    });
    try {
      await selectBackend({ backend: 'cpu' });
      await selectBackend({ backend: 'wasm' });
    } finally {
      spy.mockRestore();
    }
    const notes = writes.filter((w) => w.startsWith('apsis: TensorFlow.js backend'));
    expect(notes).toEqual(['apsis: TensorFlow.js backend "cpu" (set by option; choose with APSIS_BACKEND=cpu|wasm|tensorflow)\n']);
  });

  it('falls back to the default backend when the native package cannot be imported', async () => {
    const info = await selectBackend({ importNative: () => Promise.reject(new Error('Cannot find package')), quiet: true });
    expect(info.name).toBe(DEFAULT_BACKEND);
    expect(info.chosenBy).toBe('auto');
    expect(info.tf.getBackend()).toBe(DEFAULT_BACKEND);
    // The real dynamic import of @tensorflow/tfjs-node fails here (not installed) without breaking.
    resetNativeProbe();
    expect((await selectBackend({ quiet: true })).name).toBe(DEFAULT_BACKEND);
  });

  it('falls back when the native package imports but registers no backend', async () => {
    const info = await selectBackend({ importNative: () => Promise.resolve({}), quiet: true });
    expect(info.name).toBe(DEFAULT_BACKEND);
  });

  it('uses the native backend when importing it registers "tensorflow"', async () => {
    const tf = await loadTensorFlow();
    // Stand-in for @tensorflow/tfjs-node: the CPU backend's class and kernels under the
    // name the native package registers.
    const fakeNative = async (): Promise<void> => {
      const cpu = tf.findBackend('cpu') ?? (await tf.setBackend('cpu'), tf.findBackend('cpu'));
      const Backend = (cpu as object).constructor as new () => never;
      tf.registerBackend('tensorflow', () => new Backend());
      tf.copyRegisteredKernels('cpu', 'tensorflow');
    };
    const info = await selectBackend({ importNative: fakeNative, quiet: true });
    expect(info.name).toBe('tensorflow');
    const model = await compileModel(
      { parameters: [{ name: 'a', prior: priors.normal(0, 1) }], likelihood: tensorLikelihood((p, _e, { tf: t }) => t.neg(t.square(p.a)) as never) },
      { importNative: fakeNative, quiet: true },
    );
    expect(model.backend).toBe('tensorflow');
    const g = new Float64Array(1);
    // log N(a | 0, 1) − a² at a = 0.5: derivative −a − 2a = −1.5.
    model.logDensityGrad(Float64Array.of(0.5), g);
    expect(Math.abs(g[0] + 1.5)).toBeLessThan(1e-6);
    await selectBackend({ backend: 'cpu', quiet: true });
    tf.removeBackend('tensorflow');
  });

  it('an explicit native request without the package is an error naming the option', async () => {
    const p = selectBackend({ backend: 'tensorflow', importNative: () => Promise.reject(new Error('absent')), quiet: true });
    await expect(p).rejects.toThrow(BackendSelectionError);
    await expect(
      selectBackend({ backend: 'tensorflow', importNative: () => Promise.reject(new Error('absent')), quiet: true }),
    ).rejects.toThrow('backend = "tensorflow": expected cpu, wasm or auto: @tensorflow/tfjs-node cannot be imported here');
    await expect(selectBackend({ backend: 'gpu' as never, quiet: true })).rejects.toThrow('backend = "gpu": expected one of auto, cpu, wasm, tensorflow');
  });

  it('APSIS_BACKEND chooses, an option overrides it, and a bad value names the variable', async () => {
    process.env.APSIS_BACKEND = 'cpu';
    let info = await selectBackend({ quiet: true });
    expect([info.name, info.chosenBy]).toEqual(['cpu', 'environment']);
    info = await selectBackend({ backend: 'wasm', quiet: true });
    expect([info.name, info.chosenBy]).toEqual(['wasm', 'option']);
    process.env.APSIS_BACKEND = 'WASM ';
    expect((await selectBackend({ quiet: true })).name).toBe('wasm');
    process.env.APSIS_BACKEND = 'fast';
    await expect(selectBackend({ quiet: true })).rejects.toThrow('APSIS_BACKEND = "fast": expected one of auto, cpu, wasm, tensorflow');
  });
});

describe('console output of a fresh process', () => {
  it('shows our one line and none of TensorFlow.js’s banner or warnings', () => {
    const dir = mkdtempSync(path.join(tmpdir(), 'apsis-backend-'));
    const script = path.join(dir, 'probe.mts');
    const entry = path.join(root, 'packages/core/src/model/index.ts');
    writeFileSync(
      script,
      `import { compileModel, priors, tensorLikelihood } from ${JSON.stringify(entry)};\n` +
        `for (const backend of ['cpu', 'wasm']) {\n` +
        `  const m = await compileModel({ parameters: [{ name: 'a', prior: priors.normal(0, 1) }], data: { y: [1, 2, 3] },\n` +
        `    likelihood: tensorLikelihood((p, _e, { tf, data }) => tf.neg(tf.sum(tf.square(tf.sub(data.y, p.a))))) }, { backend });\n` +
        `  m.logDensityGrad(Float64Array.of(0.3), new Float64Array(1));\n` +
        `}\n` +
        `const auto = await compileModel({ parameters: [{ name: 'a', prior: priors.normal(0, 1) }],\n` +
        `  likelihood: tensorLikelihood((p, _e, { tf }) => tf.neg(tf.square(p.a))) });\n` +
        `console.log('backend', auto.backend);\n`,
    );
    const run = spawnSync(path.join(root, 'node_modules/.bin/tsx'), [script], { cwd: root, encoding: 'utf8', env: { ...process.env, APSIS_BACKEND: '', APSIS_QUIET: '' } });
    expect(run.status).toBe(0);
    expect(run.stderr).toBe('apsis: TensorFlow.js backend "cpu" (set by option; choose with APSIS_BACKEND=cpu|wasm|tensorflow)\n');
    // No native package here: auto falls back to the default without any noise.
    expect(run.stdout).toBe(`backend ${DEFAULT_BACKEND}\n`);
  });
});

describe('gradient gaps of TensorFlow.js give errors that say what to do', () => {
  // Known gaps recorded in DESIGN.md: gather has no gradient on WASM; tf.where with a
  // condition computed from a differentiated tensor has no gradient.
  it('gather on WASM names the missing kernel and the way out', async () => {
    const spec = {
      parameters: [{ name: 'a', size: 3, prior: priors.normal(0, 1) }],
      data: { idx: [0, 2, 1, 1] },
      likelihood: tensorLikelihood((p, _e, { tf, data }) => tf.neg(tf.sum(tf.square(tf.gather(p.a, tf.cast(data.idx, 'int32')))))),
    };
    await expect(compileModel(spec, { backend: 'wasm', quiet: true })).rejects.toThrow(
      /likelihood = "an op needing kernel UnsortedSegmentSum": expected ops that backend "wasm" implements: use backend "cpu"/,
    );
    // The same model works on the CPU backend: d/da of −Σ a[idx]² = −2 · count · a.
    const model = await compileModel(spec, { backend: 'cpu', quiet: true });
    const g = new Float64Array(3);
    model.logDensityGrad(Float64Array.of(1, 2, 3), g);
    expect(Array.from(g)).toEqual([-2 * 1 - 1, -2 * 2 * 2 - 2, -2 * 3 - 3]);
    model.dispose();
  });
  it('a condition computed on the tape names the op', async () => {
    await expect(
      compileModel(
        {
          parameters: [{ name: 'a', prior: priors.normal(0, 1) }],
          likelihood: tensorLikelihood((p, _e, { tf }) => tf.where(tf.greater(p.a, 0), p.a, tf.neg(p.a)) as never),
        },
        { backend: 'cpu', quiet: true },
      ),
    ).rejects.toThrow(/build conditions \(tf\.where, comparisons\) from values off the tape/);
  });
});

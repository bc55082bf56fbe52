/**
 * Lazy loading of TensorFlow.js. Nothing in `@apsis/core` or `@apsis/models` imports
 * TensorFlow.js statically: samplers and fused float64 models never pay for it (about
 * 0.5 s to import from an ES module, in every worker thread too, and a console banner).
 * Only a model with a TensorFlow.js likelihood, or a TensorFlow.js op, loads it.
 */
import { createRequire } from 'node:module';

export type TensorFlow = typeof import('@tensorflow/tfjs');

let loaded: TensorFlow | undefined;

/**
 * Loads `@tensorflow/tfjs` once per process, synchronously, and silences its console
 * output (the "install our node backend" banner and other warnings): TensorFlow.js's own
 * `PROD` flag routes its warnings nowhere and changes no numerics. Loaded with `require`
 * (the package's main entry is CommonJS): an ES-module `import` of the same file first
 * scans its several megabytes for export names, which measured 450–530 ms against
 * 157–167 ms for `require` (Node 20, this machine, 2026-12-01). An `import` elsewhere in
 * the process gets the same module instance.
 */
export function requireTensorFlow(): TensorFlow {
  if (loaded === undefined) {
    // Quiets native TensorFlow's C++ logging should `@tensorflow/tfjs-node` load.
    process.env.TF_CPP_MIN_LOG_LEVEL ??= '2';
    const tf = createRequire(import.meta.url)('@tensorflow/tfjs') as TensorFlow;
    tf.env().set('PROD', true);
    loaded = tf;
  }
  return loaded;
}

/** {@link requireTensorFlow} for callers that await (kept for the async call sites). */
export function loadTensorFlow(): Promise<TensorFlow> {
  return Promise.resolve().then(requireTensorFlow);
}

/**
 * Lazy loading of TensorFlow.js. Nothing in `@apsis/core` imports TensorFlow.js
 * statically: samplers and fused float64 models never pay for it (about 0.4 s to
 * import and a console banner). Only a model with a TensorFlow.js likelihood loads it.
 */
export type TensorFlow = typeof import('@tensorflow/tfjs');

let loading: Promise<TensorFlow> | undefined;

/**
 * Imports `@tensorflow/tfjs` once per process and silences its console output
 * (the "install our node backend" banner and other warnings): TensorFlow.js's own
 * `PROD` flag routes its warnings nowhere and changes no numerics.
 */
export function loadTensorFlow(): Promise<TensorFlow> {
  loading ??= (async () => {
    // Quiets native TensorFlow's C++ logging should `@tensorflow/tfjs-node` load.
    process.env.TF_CPP_MIN_LOG_LEVEL ??= '2';
    const tf = await import('@tensorflow/tfjs');
    tf.env().set('PROD', true);
    return tf;
  })();
  return loading;
}

import { createRequire } from 'node:module';
import path from 'node:path';
import { BackendSelectionError } from './errors.js';
import { loadTensorFlow, type TensorFlow } from './loadTensorFlow.js';

/**
 * TensorFlow.js backends the modelling layer can run on:
 * - `wasm`: `@tensorflow/tfjs-backend-wasm`, WebAssembly with SIMD, single thread;
 * - `cpu`: the pure-JavaScript backend shipped in `@tensorflow/tfjs`;
 * - `tensorflow`: native TensorFlow through `@tensorflow/tfjs-node`, used when it can
 *   be imported (it is an optional package; apsis does not depend on it);
 * - `auto`: `tensorflow` if importable, else {@link DEFAULT_BACKEND}.
 */
export type BackendChoice = 'auto' | 'cpu' | 'wasm' | 'tensorflow';

/**
 * The backend `auto` falls back to without native TensorFlow. Chosen by measurement
 * (bench/model-gradient.ts, docs/modelling.md): WASM computed the gradients of the
 * benchmark likelihoods 1.3 to 11 times faster than the CPU backend at N = 1e3 and 1e4
 * data points, and was never slower. Its gaps (no gradient for `gather`) are reported
 * at compile time with the way out.
 */
export const DEFAULT_BACKEND = 'wasm' as const;

/** What {@link selectBackend} settled on. */
export interface BackendInfo {
  /** Backend name as TensorFlow.js reports it (`wasm`, `cpu`, `tensorflow`). */
  readonly name: string;
  /** How it was chosen: an explicit option, the `APSIS_BACKEND` variable, or auto. */
  readonly chosenBy: 'option' | 'environment' | 'auto';
  /** The loaded TensorFlow.js module. */
  readonly tf: TensorFlow;
}

/** Options of {@link selectBackend}. */
export interface BackendOptions {
  /** Backend to use; default: the `APSIS_BACKEND` environment variable, else `auto`. */
  readonly backend?: BackendChoice;
  /** Suppresses the one-line note on stderr (also `APSIS_QUIET=1`). */
  readonly quiet?: boolean;
  /**
   * How to import the optional native package (for tests of the fallback path);
   * default: a dynamic import of `@tensorflow/tfjs-node`.
   */
  readonly importNative?: () => Promise<unknown>;
}

const CHOICES: readonly BackendChoice[] = ['auto', 'cpu', 'wasm', 'tensorflow'];
const NATIVE_PACKAGE = '@tensorflow/tfjs-node';

let noted = false;
let wasmRegistered: Promise<void> | undefined;
let nativeTried: Promise<boolean> | undefined;

function defaultImportNative(): Promise<unknown> {
  // A variable specifier keeps bundlers and the type checker from resolving it.
  const specifier: string = NATIVE_PACKAGE;
  return import(/* @vite-ignore */ specifier);
}

async function registerWasm(tf: TensorFlow): Promise<void> {
  wasmRegistered ??= (async () => {
    const wasm = await import('@tensorflow/tfjs-backend-wasm');
    // In Node the .wasm binaries are read from the package's dist folder as files.
    const entry = createRequire(import.meta.url).resolve('@tensorflow/tfjs-backend-wasm');
    wasm.setWasmPaths(path.dirname(entry) + path.sep);
    void tf;
  })();
  return wasmRegistered;
}

async function tryNative(tf: TensorFlow, importNative: () => Promise<unknown>): Promise<boolean> {
  nativeTried ??= (async () => {
    try {
      await importNative();
    } catch {
      return false;
    }
    return tf.findBackendFactory('tensorflow') != null;
  })();
  return nativeTried;
}

function readChoice(options: BackendOptions): { choice: BackendChoice; chosenBy: BackendInfo['chosenBy'] } {
  if (options.backend !== undefined) {
    if (!CHOICES.includes(options.backend)) {
      throw new BackendSelectionError('backend', options.backend, `one of ${CHOICES.join(', ')}`);
    }
    return { choice: options.backend, chosenBy: 'option' };
  }
  const env = process.env.APSIS_BACKEND;
  if (env !== undefined && env !== '') {
    const v = env.trim().toLowerCase() as BackendChoice;
    if (!CHOICES.includes(v)) {
      throw new BackendSelectionError('APSIS_BACKEND', env, `one of ${CHOICES.join(', ')}`);
    }
    return { choice: v, chosenBy: 'environment' };
  }
  return { choice: 'auto', chosenBy: 'auto' };
}

async function activate(tf: TensorFlow, name: 'cpu' | 'wasm' | 'tensorflow'): Promise<void> {
  if (tf.getBackend() === name) return;
  if (name === 'wasm') await registerWasm(tf);
  let ok = false;
  try {
    ok = await tf.setBackend(name);
  } catch {
    ok = false;
  }
  if (!ok) {
    throw new BackendSelectionError('backend', name, `a backend that initialises here (${name} failed to start)`);
  }
  await tf.ready();
}

/**
 * Loads TensorFlow.js, activates the requested backend (process-wide: TensorFlow.js
 * has one engine per process) and, once per process, prints one line on stderr
 * saying which backend is in use.
 */
export async function selectBackend(options: BackendOptions = {}): Promise<BackendInfo> {
  const { choice, chosenBy } = readChoice(options);
  const tf = await loadTensorFlow();
  let name: 'cpu' | 'wasm' | 'tensorflow';
  if (choice === 'auto') {
    const native = await tryNative(tf, options.importNative ?? defaultImportNative);
    name = native ? 'tensorflow' : DEFAULT_BACKEND;
  } else if (choice === 'tensorflow') {
    const native = await tryNative(tf, options.importNative ?? defaultImportNative);
    if (!native) {
      throw new BackendSelectionError(
        chosenBy === 'environment' ? 'APSIS_BACKEND' : 'backend',
        'tensorflow',
        `cpu, wasm or auto: ${NATIVE_PACKAGE} cannot be imported here`,
      );
    }
    name = 'tensorflow';
  } else {
    name = choice;
  }
  await activate(tf, name);
  const quiet = options.quiet === true || process.env.APSIS_QUIET === '1';
  if (!noted && !quiet) {
    noted = true;
    const how = chosenBy === 'auto' ? 'default' : chosenBy === 'option' ? 'set by option' : 'set by APSIS_BACKEND';
    process.stderr.write(
      `apsis: TensorFlow.js backend "${name}" (${how}; choose with APSIS_BACKEND=cpu|wasm|tensorflow)\n`,
    );
  }
  return { name, chosenBy, tf };
}

/** Forgets whether the native package was tried (tests of the fallback path only). */
export function resetNativeProbe(): void {
  nativeTried = undefined;
}

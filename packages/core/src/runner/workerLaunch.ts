import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import { WorkerFailureError } from './errors.js';

/** True when this module runs from TypeScript sources (tests, `tsx --conditions=source`). */
export function runningFromSource(): boolean {
  return import.meta.url.endsWith('.ts');
}

/**
 * The `file:` URL of tsx's ESM registration API, found from this package first and
 * then from the current directory. Workers started from TypeScript sources register
 * tsx through it before importing their `.ts` entry: Node 20 ignores `--import` hooks
 * in a worker's `execArgv`, so the entry is loaded by a small evaluated bootstrap.
 */
export function tsxRegisterUrl(): string {
  const bases = [import.meta.url, pathToFileURL(join(process.cwd(), 'noop.js')).href];
  for (const base of bases) {
    try {
      const manifestPath = createRequire(base).resolve('tsx/package.json');
      const manifest = JSON.parse(readFileSync(manifestPath, 'utf8')) as {
        exports?: Record<string, { import?: { default?: string } | string } | string>;
      };
      const entry = manifest.exports?.['./esm/api'];
      const rel = typeof entry === 'object' && entry !== null && typeof entry.import === 'object' ? entry.import.default : undefined;
      if (typeof rel === 'string') return pathToFileURL(join(dirname(manifestPath), rel)).href;
    } catch {
      // try the next base
    }
  }
  throw new WorkerFailureError(
    'cannot start a worker from TypeScript sources: the tsx package was not found from @apsis/core or the current directory (install tsx, or build the packages and run from dist/)',
  );
}

/** The `--conditions` flags of an `execArgv`, in `--conditions=name` form. */
export function conditionFlags(execArgv: readonly string[]): string[] {
  const out: string[] = [];
  for (let i = 0; i < execArgv.length; i++) {
    const a = execArgv[i];
    if (a.startsWith('--conditions=')) out.push(a);
    else if ((a === '--conditions' || a === '-C') && i + 1 < execArgv.length) out.push(`--conditions=${execArgv[++i]}`);
  }
  return out;
}

/** True when a module path or URL names a TypeScript file. */
export function isTypeScriptModule(module: string): boolean {
  return /\.(c|m)?tsx?$/.test(module);
}

/**
 * Starts a worker thread running the chain worker entry with `workerData`. From
 * `dist/` this is plain `chainWorker.js` (with the calling process's `execArgv`);
 * from sources, `chainWorker.ts` is loaded through tsx with the `source` export
 * condition, so workspace packages resolve to their TypeScript sources as in the
 * calling thread. `typeScriptTarget` registers tsx from `dist/` as well, for a
 * recipe whose module is a `.ts` file.
 */
export function launchChainWorker(workerData: unknown, typeScriptTarget = false): Worker {
  const fromSource = runningFromSource();
  const entry = new URL(fromSource ? './chainWorker.ts' : './chainWorker.js', import.meta.url);
  if (!fromSource && !typeScriptTarget) return new Worker(entry, { workerData });
  const register = tsxRegisterUrl();
  const bootstrap = [
    `const { parentPort } = require('node:worker_threads');`,
    `import(${JSON.stringify(register)})`,
    `  .then((tsx) => { tsx.register(); return import(${JSON.stringify(entry.href)}); })`,
    `  .catch((e) => parentPort.postMessage({ type: 'failed', name: (e && e.name) || 'Error', message: 'worker bootstrap: ' + ((e && e.message) || String(e)) }));`,
  ].join('\n');
  const execArgv = fromSource ? ['--conditions=source'] : conditionFlags(process.execArgv);
  return new Worker(bootstrap, { eval: true, workerData, execArgv });
}

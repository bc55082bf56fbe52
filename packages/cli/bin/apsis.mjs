#!/usr/bin/env node
// The `apsis` command. Runs the built CLI (../dist/main.js) when present; otherwise runs
// the TypeScript sources through tsx in a child process with the `source` export
// condition, so workspace packages resolve to their sources too.
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { constants } from 'node:os';
import { fileURLToPath, pathToFileURL } from 'node:url';

const built = new URL('../dist/main.js', import.meta.url);
if (existsSync(fileURLToPath(built))) {
  await import(built.href);
} else {
  const source = fileURLToPath(new URL('../src/main.ts', import.meta.url));
  let loader;
  for (const base of [import.meta.url, pathToFileURL(`${process.cwd()}/noop.js`).href]) {
    try {
      loader = pathToFileURL(createRequire(base).resolve('tsx')).href;
      break;
    } catch {
      // try the next base
    }
  }
  if (loader === undefined) {
    process.stderr.write('apsis: the CLI is not built (no dist/main.js) and tsx was not found to run its sources; run `pnpm build`\n');
    process.exit(2);
  }
  const child = spawn(process.execPath, ['--conditions=source', '--import', loader, source, ...process.argv.slice(2)], { stdio: 'inherit' });
  // Ctrl-C reaches the child through the terminal's process group; stay alive until it exits.
  process.on('SIGINT', () => {});
  process.on('SIGTERM', () => child.kill('SIGTERM'));
  child.on('exit', (code, signal) => process.exit(signal ? 128 + (constants.signals[signal] ?? 1) : (code ?? 2)));
}

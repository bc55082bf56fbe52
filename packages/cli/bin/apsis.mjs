#!/usr/bin/env node
// The `apsis` command. Runs the built CLI (../dist/main.js) when present. Otherwise it
// runs the TypeScript sources: it adds the `source` export condition (so workspace
// packages resolve to their sources too) with a module resolve hook, registers tsx,
// and imports ../src/main.ts.
import { existsSync, readFileSync } from 'node:fs';
import { createRequire, register } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const built = new URL('../dist/main.js', import.meta.url);
if (existsSync(fileURLToPath(built))) {
  await import(built.href);
} else {
  let tsxApi;
  for (const base of [import.meta.url, pathToFileURL(join(process.cwd(), 'noop.js')).href]) {
    try {
      const manifest = createRequire(base).resolve('tsx/package.json');
      const entry = JSON.parse(readFileSync(manifest, 'utf8')).exports['./esm/api'].import.default;
      tsxApi = pathToFileURL(join(dirname(manifest), entry)).href;
      break;
    } catch {
      // try the next base
    }
  }
  if (tsxApi === undefined) {
    process.stderr.write('apsis: the CLI is not built (no dist/main.js) and tsx was not found to run its sources; run `pnpm build`\n');
    process.exit(2);
  }
  const sourceCondition = 'export async function resolve(specifier, context, next) { return next(specifier, { ...context, conditions: [...new Set([...context.conditions, "source"])] }); }';
  register(`data:text/javascript,${encodeURIComponent(sourceCondition)}`);
  (await import(tsxApi)).register();
  await import(new URL('../src/main.ts', import.meta.url).href);
}

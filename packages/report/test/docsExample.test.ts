/**
 * Runs the code samples of docs/report.md, so the documentation cannot rot: every
 * ```ts block is written to a temporary module (with '@apsis/report' pointed at
 * this package's source) and imported.
 */
import { existsSync } from 'node:fs';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { afterAll, describe, expect, it } from 'vitest';

const docs = fileURLToPath(new URL('../../../docs/report.md', import.meta.url));
const source = fileURLToPath(new URL('../src/index.ts', import.meta.url));

describe('docs/report.md code samples', () => {
  let dir = '';
  afterAll(async () => {
    if (dir) await rm(dir, { recursive: true, force: true });
  });
  it('run and write the report they describe', async () => {
    const text = await readFile(docs, 'utf8');
    const blocks = [...text.matchAll(/```ts\n([\s\S]*?)```/g)].map((m) => m[1]);
    expect(blocks.length).toBeGreaterThan(0);
    dir = await mkdtemp(join(tmpdir(), 'apsis-report-docs-'));
    process.env.REPORT_DIR = dir;
    for (const [i, code] of blocks.entries()) {
      const file = join(dir, `sample-${i}.ts`);
      await writeFile(file, code.replaceAll("'@apsis/report'", JSON.stringify(source)));
      await import(/* @vite-ignore */ pathToFileURL(file).href);
    }
    expect(existsSync(join(dir, 'example-run', 'report.html'))).toBe(true);
    const html = await readFile(join(dir, 'example-run', 'report.html'), 'utf8');
    expect(html.includes('<title>Example run</title>')).toBe(true);
  });
});

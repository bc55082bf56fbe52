/**
 * Every code sample in docs/*.md is checked, so that no sample can rot. The convention
 * (documented in docs/README.md, "Code samples"): an HTML comment on the line right
 * before a fenced block says what the block is.
 *
 *   <!-- sample: run -->            a whole program: type-checked, then run with tsx and
 *                                   the `source` condition; it must exit with status 0
 *   <!-- sample: output -->         (before a text block) the exact standard output of
 *                                   the last `run` sample above it on the page
 *   <!-- sample: types -->          a whole module, type-checked only (needs data, or is slow)
 *   <!-- sample: types | DECLS -->  type-checked after the TypeScript declarations DECLS,
 *                                   e.g. `declare const target: import('@apsis/core').Target;`
 *   <!-- sample: file PATH -->      the block is the repository file PATH, verbatim
 *   <!-- sample: excerpt PATH -->   every non-blank line of the block occurs in PATH
 *   <!-- sample: fragment WHY -->   not a program (fields of an object, a signature): not checked
 *   <!-- sample: demo-output -->    (before a text block) lines printed by `pnpm demo`: checked
 *                                   against a full demo run by tests/demo-full.test.ts
 *
 * Every ```ts block must carry one of these, except on pages whose samples have their
 * own test (listed in `coveredElsewhere`, checked to exist). Besides the samples, the
 * test checks that shell commands name files that exist and that relative links
 * between pages resolve.
 */
import { spawn } from 'node:child_process';
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { mkdir, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import ts from 'typescript';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const docsDir = path.join(root, 'docs');
// Inside the repository (so bare imports resolve through its node_modules), ignored by
// git (the `.vitest-*` pattern of .gitignore).
const scratch = path.join(root, '.vitest-docs-samples');

/** Pages whose code samples are run by a test of their own. */
const coveredElsewhere: Record<string, string> = {
  'custom-likelihood.md': 'tests/model-robust-regression.test.ts',
  'report.md': 'packages/report/test/docsExample.test.ts',
  'fitting-radial-velocities.md': 'tests/models-examples.test.ts',
  'fitting-transits.md': 'tests/models-examples.test.ts',
  'joint-fit.md': 'tests/models-examples.test.ts',
};

type Kind = 'run' | 'output' | 'types' | 'file' | 'excerpt' | 'fragment' | 'demo-output';
const kinds: readonly Kind[] = ['run', 'output', 'types', 'file', 'excerpt', 'fragment', 'demo-output'];

interface Block {
  readonly page: string;
  /** 1-based line of the opening fence. */
  readonly line: number;
  readonly lang: string;
  readonly code: string;
  readonly marker: { kind: Kind; argument: string; prelude: string } | null;
  /** Problems with the marker itself. */
  readonly markerError: string | null;
}

/** The fenced blocks of a Markdown page, with their sample markers. */
function parseBlocks(page: string, text: string): Block[] {
  const lines = text.split('\n');
  const blocks: Block[] = [];
  for (let i = 0; i < lines.length; i++) {
    const open = /^(\s*)(`{3,}|~{3,})\s*([\w+-]*)/.exec(lines[i]);
    if (!open) continue;
    const [, indent, fence, lang] = open;
    const body: string[] = [];
    let j = i + 1;
    for (; j < lines.length; j++) {
      const close = /^\s*(`{3,}|~{3,})\s*$/.exec(lines[j]);
      if (close && close[1][0] === fence[0] && close[1].length >= fence.length) break;
      body.push(lines[j].startsWith(indent) ? lines[j].slice(indent.length) : lines[j].trimStart());
    }
    let marker: Block['marker'] = null;
    let markerError: string | null = null;
    if (i > 0 && lines[i - 1].trim().endsWith('-->')) {
      let k = i - 1;
      while (k > 0 && !lines[k].includes('<!--')) k--;
      const comment = lines
        .slice(k, i)
        .join('\n')
        .replace(/^[\s\S]*?<!--/, '')
        .replace(/-->\s*$/, '')
        .trim();
      const m = /^sample:\s*([\w-]+)\s*([\s\S]*)$/.exec(comment);
      if (m) {
        const kind = m[1] as Kind;
        if (!kinds.includes(kind)) markerError = `unknown sample kind "${m[1]}" (expected one of ${kinds.join(', ')})`;
        else {
          const [argument, ...rest] = m[2].split('|');
          marker = { kind, argument: argument.trim(), prelude: rest.join('|').trim() };
        }
      }
    }
    blocks.push({ page, line: i + 1, lang: lang.toLowerCase(), code: body.join('\n') + '\n', marker, markerError });
    i = j;
  }
  return blocks;
}

const pages = readdirSync(docsDir)
  .filter((f) => f.endsWith('.md'))
  .sort();
const allBlocks = pages.flatMap((p) => parseBlocks(p, readFileSync(path.join(docsDir, p), 'utf8')));
const isTs = (b: Block): boolean => b.lang === 'ts' || b.lang === 'typescript';
const checked = allBlocks.filter((b) => !(b.page in coveredElsewhere));
const where = (b: Block): string => `docs/${b.page}:${b.line}`;
const samples = (kind: Kind): Block[] => checked.filter((b) => b.marker?.kind === kind);

/** File name of a sample's module in the scratch folder. */
const moduleName = (b: Block): string => `${b.page.replace(/\.md$/, '').replace(/[^\w-]/g, '_')}-line${b.line}.ts`;

/** The module text of a `run` or `types` sample: prelude, then the code; always an ES module. */
function moduleText(b: Block): string {
  const prelude = b.marker?.prelude ? `${b.marker.prelude}\n` : '';
  return `${prelude}${b.code}export {};\n`;
}

/** Runs one sample module with tsx and the source condition; resolves to its exit status and output. */
function runSample(file: string, cwd: string): Promise<{ status: number | null; stdout: string; stderr: string }> {
  const loader = pathToFileURL(createRequire(import.meta.url).resolve('tsx')).href;
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, ['--import', loader, '--conditions=source', file], {
      cwd,
      env: { ...process.env, CI: '1', APSIS_QUIET: '1', FORCE_COLOR: '0', NO_COLOR: '1' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    const timer = setTimeout(() => child.kill('SIGKILL'), 90_000);
    child.on('error', reject);
    child.on('close', (status) => {
      clearTimeout(timer);
      resolve({ status, stdout, stderr });
    });
  });
}

describe('docs code samples', () => {
  beforeAll(async () => {
    await rm(scratch, { recursive: true, force: true });
    await mkdir(scratch, { recursive: true });
    for (const b of [...samples('run'), ...samples('types')]) await writeFile(path.join(scratch, moduleName(b)), moduleText(b));
  });
  afterAll(async () => {
    await rm(scratch, { recursive: true, force: true });
  });

  it('every TypeScript block is marked (or its page has its own test)', () => {
    const unmarked = checked.filter((b) => isTs(b) && b.marker === null).map(where);
    const badMarkers = checked.filter((b) => b.markerError !== null).map((b) => `${where(b)}: ${b.markerError}`);
    expect(badMarkers).toEqual([]);
    expect(unmarked, 'mark each with <!-- sample: run | types | file | excerpt | fragment --> (docs/README.md, "Code samples")').toEqual([]);
    // A run that the docs would present as checked must actually exist.
    expect(samples('run').length + samples('types').length).toBeGreaterThan(0);
  });

  it('pages listed as covered elsewhere are named by the test that covers them', () => {
    for (const [page, test] of Object.entries(coveredElsewhere)) {
      const file = path.join(root, test);
      expect(existsSync(file), `${test} (covers docs/${page})`).toBe(true);
      expect(readFileSync(file, 'utf8')).toContain(page);
    }
  });

  it('file and excerpt samples match the repository files they name', () => {
    for (const b of [...samples('file'), ...samples('excerpt')]) {
      const file = path.join(root, b.marker!.argument);
      expect(existsSync(file), `${where(b)} names ${b.marker!.argument}`).toBe(true);
      const source = readFileSync(file, 'utf8');
      if (b.marker!.kind === 'file') expect(b.code, `${where(b)} is ${b.marker!.argument} verbatim`).toBe(source);
      else for (const l of b.code.split('\n').filter((x) => x.trim() !== '')) expect(source, where(b)).toContain(l.trim());
    }
  });

  it('type-checks every run and types sample against the workspace sources', () => {
    const config = ts.getParsedCommandLineOfConfigFile(path.join(root, 'tsconfig.json'), {}, {
      ...ts.sys,
      onUnRecoverableConfigFileDiagnostic: (d) => {
        throw new Error(ts.flattenDiagnosticMessageText(d.messageText, '\n'));
      },
    });
    const files = [...samples('run'), ...samples('types')].map((b) => ({ b, file: path.join(scratch, moduleName(b)) }));
    const program = ts.createProgram(
      files.map((f) => f.file),
      { ...config!.options, noEmit: true },
    );
    const problems: string[] = [];
    for (const { b, file } of files) {
      const source = program.getSourceFile(file)!;
      const offset = b.marker!.prelude ? b.marker!.prelude.split('\n').length : 0;
      for (const d of [...program.getSyntacticDiagnostics(source), ...program.getSemanticDiagnostics(source)]) {
        const at = d.start === undefined ? 0 : source.getLineAndCharacterOfPosition(d.start).line - offset;
        const text = ts.flattenDiagnosticMessageText(d.messageText, '\n');
        problems.push(at >= 0 ? `docs/${b.page}:${b.line + 1 + at}: ${text}` : `${where(b)} (in the marker's declarations): ${text}`);
      }
    }
    expect(problems).toEqual([]);
  });

  for (const b of samples('run')) {
    it(`runs ${where(b)}`, async () => {
      const cwd = path.join(tmpdir(), `apsis-docs-sample-${process.pid}-${b.line}`);
      await mkdir(cwd, { recursive: true });
      try {
        const r = await runSample(path.join(scratch, moduleName(b)), cwd);
        expect(r.status, `${where(b)} exited with ${r.status}; stderr:\n${r.stderr}`).toBe(0);
        // Output blocks that follow this sample (before the next run sample) show its output.
        const later = checked.filter((x) => x.page === b.page && x.line > b.line);
        const nextRun = later.find((x) => x.marker?.kind === 'run');
        for (const out of later.filter((x) => x.marker?.kind === 'output' && (!nextRun || x.line < nextRun.line))) {
          expect(r.stdout, `docs/${out.page}:${out.line} shows the output of ${where(b)}`).toBe(out.code);
        }
      } finally {
        await rm(cwd, { recursive: true, force: true });
      }
    });
  }

  it('every output block follows a run sample; output and demo-output blocks are text', () => {
    for (const out of samples('output')) {
      const before = checked.filter((x) => x.page === out.page && x.line < out.line && x.marker?.kind === 'run');
      expect(before.length, `${where(out)} has no run sample above it`).toBeGreaterThan(0);
    }
    for (const b of [...samples('output'), ...samples('demo-output')]) expect(b.lang, where(b)).toBe('text');
  });

  it('shell commands in the docs name files that exist', () => {
    const missing: string[] = [];
    for (const b of allBlocks.filter((x) => ['sh', 'bash', 'shell', ''].includes(x.lang))) {
      for (const m of b.code.matchAll(/(?:tsx|node)(?:\s+--?[\w=-]+)*\s+((?:examples|bench|packages|tests)\/[\w./-]+\.(?:ts|js|mjs))/g)) {
        if (!existsSync(path.join(root, m[1]))) missing.push(`${where(b)}: ${m[1]}`);
      }
    }
    for (const page of pages) {
      const text = readFileSync(path.join(docsDir, page), 'utf8');
      for (const m of text.matchAll(/`npx tsx --conditions=source ((?:examples|bench)\/[\w./-]+\.ts)/g)) {
        if (!existsSync(path.join(root, m[1]))) missing.push(`docs/${page}: ${m[1]}`);
      }
    }
    expect(missing).toEqual([]);
  });

  it('relative links between pages and to repository files resolve', () => {
    const broken: string[] = [];
    for (const page of pages) {
      const text = readFileSync(path.join(docsDir, page), 'utf8').replace(/```[\s\S]*?```/g, '');
      for (const m of text.matchAll(/\]\(([^)\s]+)\)/g)) {
        const target = m[1].split('#')[0];
        if (target === '' || /^[a-z]+:/i.test(target)) continue;
        if (!existsSync(path.resolve(docsDir, target))) broken.push(`docs/${page}: ${m[1]}`);
      }
    }
    expect(broken).toEqual([]);
  });
});

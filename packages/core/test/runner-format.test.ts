import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { createRandomStream } from '../src/random/index.js';
import { createRowBlock } from '../src/runner/rowBlock.js';
import { csvField, formatNumber, formatRows, parseNumber, splitCsvLine, traceHeader } from '../src/runner/traceFormat.js';
import { readTraceFile } from '../src/runner/traceReader.js';
import { checkRelativePath } from '../src/runner/folderPaths.js';

const root = mkdtempSync(join(tmpdir(), 'apsis-format-'));
afterAll(() => rmSync(root, { recursive: true, force: true }));

describe('trace text format', () => {
  it('writes float64 numbers that read back to the same bits', () => {
    // ECMA-262, Number::toString: the shortest decimal that rounds back to the same
    // double; negative zero, NaN and the infinities need their own spellings.
    const rng = createRandomStream('format round trip');
    const special = [-0, 0, Number.MIN_VALUE, -Number.MAX_VALUE, 2 ** -1074 * 3, 1e21, 1e-7, 0.1 + 0.2, NaN, Infinity, -Infinity];
    const random = Array.from({ length: 2000 }, () => (rng.uniform() - 0.5) * 10 ** Math.floor(60 * rng.uniform() - 30));
    for (const x of [...special, ...random]) expect(Object.is(parseNumber(formatNumber(x)), x)).toBe(true);
    expect(formatNumber(-0)).toBe('-0');
    for (const bad of ['', ' 1', '1 ', 'abc', '1,5']) expect(Number.isNaN(parseNumber(bad))).toBe(true);
  });

  it('quotes names with commas or quotes in the header and splits them back (RFC 4180)', () => {
    const names = ['plain', 'with,comma', 'with "quote"', 'period[1]'];
    expect(csvField('with "quote"')).toBe('"with ""quote"""');
    const header = traceHeader(names, ['derived, scaled']);
    expect(splitCsvLine(header.trimEnd())).toEqual([
      'iteration', 'step_size', 'tree_depth', 'gradient_evals', 'diverged', 'hamiltonian', 'acceptance', 'log_density',
      'u:plain', 'u:with,comma', 'u:with "quote"', 'u:period[1]', 'derived, scaled',
    ]);
    expect(splitCsvLine('"open,')).toBeNull();
  });

  it('rows written by the writer are read back exactly, iteration by iteration', () => {
    const dim = 3;
    const outputs = 1;
    const block = createRowBlock(0, 0, 50, dim, outputs);
    const rng = createRandomStream('rows');
    block.count = 50;
    for (let i = 0; i < block.draws.length; i++) block.draws[i] = rng.normal() * 1e-3;
    for (let i = 0; i < block.stats.length; i++) block.stats[i] = i % 7 === 1 || i % 7 === 2 ? Math.floor(10 * rng.uniform()) : rng.normal();
    for (let i = 0; i < block.outputs.length; i++) block.outputs[i] = rng.exponential();
    const header = traceHeader(['a', 'b', 'c'], ['d']);
    const path = join(root, 'trace.csv');
    writeFileSync(path, header + formatRows(block, dim, outputs));
    const read = readTraceFile(path, { header, dim, outputs, label: 'trace.csv', chain: 0 });
    expect(read.block.count).toBe(50);
    expect(read.block.draws).toEqual(block.draws);
    expect(read.block.stats).toEqual(block.stats);
    expect(read.block.outputs).toEqual(block.outputs);
    expect(read.notes).toEqual([]);
    // A repeated iteration is not torn data but damage: an error naming the line.
    writeFileSync(path, header + formatRows(block, dim, outputs) + formatRows({ ...block, count: 2 }, dim, outputs));
    expect(() => readTraceFile(path, { header, dim, outputs, label: 'trace.csv', chain: 0 })).toThrow(/line 52: expected iteration 50, found "0"/);
  });

  it('accepts only plain relative paths inside the folder', () => {
    expect(checkRelativePath('traces/chain-0.csv', 'f')).toEqual(['traces', 'chain-0.csv']);
    for (const bad of ['/etc/passwd', 'C:/x', 'a\\b', 'a/../b', './a', 'a//b', '', 'x\0y']) {
      expect(() => checkRelativePath(bad, 'f')).toThrow(/f = /);
    }
  });
});

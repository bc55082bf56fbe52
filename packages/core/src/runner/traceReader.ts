import { readFileSync } from 'node:fs';
import { RunFolderError } from './errors.js';
import { statsPerRow, type RowBlock } from './rowBlock.js';
import { parseNumber } from './traceFormat.js';

/** What was read from one trace file. */
export interface ReadTrace {
  /** The complete, valid rows, iteration 0 onwards. */
  readonly block: RowBlock;
  /** Byte offset just after the last valid row (where appending would continue). */
  readonly goodBytes: number;
  /** Plain-words notes about what was ignored (a torn last line). */
  readonly notes: string[];
  /** Byte offset just after row `markRows − 1` (the header's end for 0); null when the file has fewer rows. */
  readonly markBytes: number | null;
}

/** What a trace file must look like. */
export interface TraceShape {
  /** The exact header line, newline included. */
  readonly header: string;
  readonly dim: number;
  readonly outputs: number;
  /** Name used in messages, e.g. `traces/chain-1.csv`. */
  readonly label: string;
  readonly chain: number;
  /** Read at most this many rows (the rest of the file is not examined). */
  readonly maxRows?: number;
  /** Report the byte offset after this many rows in `markBytes`. */
  readonly markRows?: number;
}

function countNewlines(text: string, from: number): number {
  let n = 0;
  for (let i = text.indexOf('\n', from); i >= 0; i = text.indexOf('\n', i + 1)) n++;
  return n;
}

/**
 * Reads a trace file written by the runner. A last line without its newline, or a
 * last line that does not parse, is taken as torn by an interruption: it is ignored
 * and reported in `notes`. Anything wrong before the last line (a bad header, a
 * malformed row, an iteration out of sequence) throws {@link RunFolderError} naming
 * the file and line.
 */
export function readTraceFile(path: string, shape: TraceShape): ReadTrace {
  let text: string;
  try {
    text = readFileSync(path, 'utf8');
  } catch (e) {
    throw new RunFolderError(`cannot read trace file ${shape.label}: ${(e as Error).message}`);
  }
  const headerEnd = text.indexOf('\n');
  if (headerEnd < 0) {
    throw new RunFolderError(`trace file ${shape.label} is truncated: it has no complete header line (${text.length} characters)`);
  }
  const header = text.slice(0, headerEnd + 1);
  if (header !== shape.header) {
    throw new RunFolderError(
      `trace file ${shape.label}: header ${JSON.stringify(header.slice(0, 120).trimEnd())} does not match the manifest's columns ${JSON.stringify(shape.header.slice(0, 120).trimEnd())}`,
    );
  }
  const { dim, outputs } = shape;
  const fields = 1 + statsPerRow + dim + outputs;
  const capacity = Math.min(countNewlines(text, headerEnd + 1), shape.maxRows ?? Infinity);
  const draws = new Float64Array(capacity * dim);
  const stats = new Float64Array(capacity * statsPerRow);
  const outs = new Float64Array(capacity * outputs);
  const notes: string[] = [];
  let rows = 0;
  let pos = headerEnd + 1;
  let goodBytes = Buffer.byteLength(header, 'utf8');
  let line = 2;
  let markBytes: number | null = shape.markRows === 0 ? goodBytes : null;
  while (pos < text.length) {
    const end = text.indexOf('\n', pos);
    if (end >= 0 && rows >= capacity) break;
    if (end < 0) {
      if (shape.maxRows !== undefined && rows >= shape.maxRows) break;
      notes.push(
        `${shape.label}: the last line (${text.length - pos} characters, no newline) was cut off, probably when the run was interrupted; it was ignored`,
      );
      break;
    }
    const parts = text.slice(pos, end).split(',');
    const problem = rowProblem(parts, fields, rows, draws, stats, outs, dim, outputs);
    if (problem !== null) {
      const isLast = end === text.length - 1;
      if (isLast && shape.maxRows === undefined) {
        notes.push(`${shape.label}: the last line (line ${line}) is damaged (${problem}), probably torn by an interruption; it was ignored`);
        break;
      }
      throw new RunFolderError(`trace file ${shape.label}, line ${line}: ${problem}`);
    }
    rows++;
    goodBytes += end + 1 - pos;
    if (rows === shape.markRows) markBytes = goodBytes;
    pos = end + 1;
    line++;
  }
  return {
    block: {
      chain: shape.chain,
      first: 0,
      count: rows,
      draws: draws.subarray(0, rows * dim),
      stats: stats.subarray(0, rows * statsPerRow),
      outputs: outs.subarray(0, rows * outputs),
    },
    goodBytes,
    notes,
    markBytes,
  };
}

function rowProblem(
  parts: string[],
  fields: number,
  row: number,
  draws: Float64Array,
  stats: Float64Array,
  outs: Float64Array,
  dim: number,
  outputs: number,
): string | null {
  if (parts.length !== fields) return `expected ${fields} fields, found ${parts.length}`;
  if (parts[0] !== String(row)) return `expected iteration ${row}, found ${JSON.stringify(parts[0].slice(0, 20))}`;
  for (let f = 1; f < fields; f++) {
    const v = parseNumber(parts[f]);
    if (Number.isNaN(v) && parts[f] !== 'NaN') return `field ${f + 1} = ${JSON.stringify(parts[f].slice(0, 30))} is not a number`;
    if (f <= statsPerRow) stats[row * statsPerRow + f - 1] = v;
    else if (f <= statsPerRow + dim) draws[row * dim + f - 1 - statsPerRow] = v;
    else outs[row * outputs + f - 1 - statsPerRow - dim] = v;
  }
  return null;
}

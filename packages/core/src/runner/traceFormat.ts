import { statsPerRow, type RowBlock } from './rowBlock.js';

/**
 * Leading columns of every trace row: the iteration index (0-based, warmup included)
 * and the seven sampler statistics of that iteration.
 */
export const traceStatColumns = [
  'iteration',
  'step_size',
  'tree_depth',
  'gradient_evals',
  'diverged',
  'hamiltonian',
  'acceptance',
  'log_density',
] as const;

/** Prefix of coordinate (unconstrained position) columns in a trace header. */
export const coordinatePrefix = 'u:';

/** One header or row field, quoted as CSV when it contains a comma, quote or line break. */
export function csvField(text: string): string {
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

/** Splits one CSV line into fields (RFC 4180 quoting). Returns null for an unterminated quote. */
export function splitCsvLine(line: string): string[] | null {
  const out: string[] = [];
  let i = 0;
  for (;;) {
    if (line[i] === '"') {
      let text = '';
      i++;
      for (;;) {
        const q = line.indexOf('"', i);
        if (q < 0) return null;
        text += line.slice(i, q);
        if (line[q + 1] === '"') {
          text += '"';
          i = q + 2;
        } else {
          i = q + 1;
          break;
        }
      }
      out.push(text);
      if (i === line.length) return out;
      if (line[i] !== ',') return null;
      i++;
    } else {
      const c = line.indexOf(',', i);
      if (c < 0) {
        out.push(line.slice(i));
        return out;
      }
      out.push(line.slice(i, c));
      i = c + 1;
    }
  }
}

/** The header line (with its newline) of a trace with these coordinate and output names. */
export function traceHeader(coordinates: readonly string[], outputs: readonly string[]): string {
  const names = [...traceStatColumns, ...coordinates.map((n) => coordinatePrefix + n), ...outputs];
  return names.map(csvField).join(',') + '\n';
}

/**
 * A float64 as text that reads back to the same bits: shortest round-trip decimal,
 * `-0` for negative zero, `NaN`, `Infinity`, `-Infinity`.
 */
export function formatNumber(x: number): string {
  if (x === 0) return Object.is(x, -0) ? '-0' : '0';
  return String(x);
}

/** The rows of a block as trace lines, each ending with a newline. */
export function formatRows(block: RowBlock, dim: number, outputs: number): string {
  const lines: string[] = new Array(block.count);
  const fields: string[] = new Array(1 + statsPerRow + dim + outputs);
  for (let r = 0; r < block.count; r++) {
    let f = 0;
    fields[f++] = String(block.first + r);
    for (let k = r * statsPerRow, e = k + statsPerRow; k < e; k++) fields[f++] = formatNumber(block.stats[k]);
    for (let k = r * dim, e = k + dim; k < e; k++) fields[f++] = formatNumber(block.draws[k]);
    for (let k = r * outputs, e = k + outputs; k < e; k++) fields[f++] = formatNumber(block.outputs[k]);
    lines[r] = fields.join(',');
  }
  return lines.join('\n') + '\n';
}

/** Parses one numeric field; NaN for text that is not a number written by {@link formatNumber}. */
export function parseNumber(text: string): number {
  if (text.length === 0 || text.trim() !== text) return NaN;
  return Number(text);
}

import { decimalsFor, formatFixed, formatSignificant, percentLabel } from './formatNumber.js';
import { CONSTANT_NOTE, type QuantitySummary, type SummaryTable } from './summary.js';

/**
 * The summary as an aligned plain-text table. Columns: quantity, mean, std dev, median, one
 * column per quantile ("at 5%" ...), "MC error" (of the mean), "bulk ESS", "tail ESS",
 * "R-hat". Undefined values are written in words, never NaN.
 */

interface Column {
  readonly title: string;
  readonly left: boolean;
  readonly cell: (row: QuantitySummary) => string;
}

function rhatCell(row: QuantitySummary): string {
  if (row.rhat !== null) return row.rhat.toFixed(3);
  if (row.notes.includes(CONSTANT_NOTE)) return CONSTANT_NOTE;
  if (row.notes.some((n) => n.startsWith('R-hat infinite'))) return 'infinite';
  return 'undefined';
}

function essCell(value: number | null): string {
  return value === null ? 'undefined' : String(Math.round(value));
}

function columnsFor(table: SummaryTable): Column[] {
  const value = (pick: (r: QuantitySummary) => number) => (r: QuantitySummary) => formatFixed(pick(r), decimalsFor(r.sd > 0 ? r.sd : Math.abs(r.mean) / 1000));
  const columns: Column[] = [
    { title: 'quantity', left: true, cell: (r) => r.name },
    { title: 'mean', left: false, cell: value((r) => r.mean) },
    { title: 'std dev', left: false, cell: (r) => formatSignificant(r.sd, 3) },
    { title: 'median', left: false, cell: value((r) => r.median) },
  ];
  table.quantileLevels.forEach((p, i) => columns.push({ title: `at ${percentLabel(p)}`, left: false, cell: value((r) => r.quantiles[i].value) }));
  columns.push(
    { title: 'MC error', left: false, cell: (r) => (r.mcseMean === null ? 'undefined' : formatSignificant(r.mcseMean)) },
    { title: 'bulk ESS', left: false, cell: (r) => essCell(r.bulkEss) },
    { title: 'tail ESS', left: false, cell: (r) => essCell(r.tailEss) },
    { title: 'R-hat', left: false, cell: rhatCell },
  );
  return columns;
}

/** Renders the table with a one-line header describing the run and a blank line between parts. */
export function formatSummaryText(table: SummaryTable): string {
  const columns = columnsFor(table);
  const cells = table.rows.map((row) => columns.map((c) => c.cell(row)));
  const widths = columns.map((c, j) => Math.max(c.title.length, ...cells.map((r) => r[j].length)));
  const line = (parts: string[]): string =>
    parts
      .map((p, j) => (columns[j].left ? p.padEnd(widths[j]) : p.padStart(widths[j])))
      .join('  ')
      .trimEnd();
  const out: string[] = [];
  out.push(`${table.rows.length} ${table.rows.length === 1 ? 'quantity' : 'quantities'}, ${table.chains} chains of ${table.drawsPerChain} draws`);
  out.push('');
  out.push(line(columns.map((c) => c.title)));
  out.push(line(widths.map((w) => '-'.repeat(w))));
  for (const r of cells) out.push(line(r));
  const notes = table.rows.filter((r) => r.notes.length > 0).map((r) => `  ${r.name}: ${r.notes.join('; ')}`);
  if (notes.length > 0 || table.notices.length > 0) {
    out.push('');
    out.push('Notes:');
    out.push(...notes);
    for (const n of table.notices) out.push(`  ${n.message}`);
  }
  out.push('');
  out.push('MC error: Monte Carlo standard error of the mean. ESS: effective sample size (draws). R-hat: rank-normalised split R-hat, larger of bulk and folded.');
  return out.join('\n') + '\n';
}

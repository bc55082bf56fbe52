import type { SummaryTable } from './summary.js';

/**
 * The summary as CSV (RFC 4180: comma-separated, CRLF-free "\n" line ends, fields quoted
 * when they hold a comma, quote or line break). Undefined values are empty fields; the
 * `notes` column says why. Numbers are written with full float64 precision.
 *
 * Columns: quantity, mean, std_dev, median, quantile_<p> (one per level, p as a decimal,
 * e.g. quantile_0.05), mean_mc_error, bulk_eff_draws, tail_eff_draws, eff_draws_of_mean,
 * split_r_hat, split_r_hat_bulk, split_r_hat_folded, notes.
 */

function field(value: string): string {
  return /[",\n\r]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

function num(value: number | null): string {
  return value === null || !Number.isFinite(value) ? '' : String(value);
}

/** Column names of the CSV for given quantile levels. */
export function summaryCsvColumns(levels: readonly number[]): string[] {
  return [
    'quantity',
    'mean',
    'std_dev',
    'median',
    ...levels.map((p) => `quantile_${p}`),
    'mean_mc_error',
    'bulk_eff_draws',
    'tail_eff_draws',
    'eff_draws_of_mean',
    'split_r_hat',
    'split_r_hat_bulk',
    'split_r_hat_folded',
    'notes',
  ];
}

export function summaryToCsv(table: SummaryTable): string {
  const lines = [summaryCsvColumns(table.quantileLevels).join(',')];
  for (const r of table.rows) {
    lines.push(
      [
        field(r.name),
        num(r.mean),
        num(r.sd),
        num(r.median),
        ...r.quantiles.map((q) => num(q.value)),
        num(r.mcseMean),
        num(r.bulkEss),
        num(r.tailEss),
        num(r.essMean),
        num(r.rhat),
        num(r.rhatBulk),
        num(r.rhatFolded),
        field(r.notes.join('; ')),
      ].join(','),
    );
  }
  return lines.join('\n') + '\n';
}

import type { SummaryTable } from './summary.js';

/**
 * The summary as JSON: a versioned object
 *   { "format": "apsis-diagnostics-summary", "version": 1, "chains", "drawsPerChain",
 *     "quantileLevels", "quantities": [row...], "notices": [warning...] }
 * where each row has the fields of QuantitySummary (name, mean, sd, median,
 * quantiles [{probability, value}], mcseMean, bulkEss, tailEss, essMean, rhat, rhatBulk,
 * rhatFolded, notes). Undefined values are null, never NaN.
 */
export const SUMMARY_JSON_FORMAT = 'apsis-diagnostics-summary';

export function summaryToJsonValue(table: SummaryTable): Record<string, unknown> {
  return {
    format: SUMMARY_JSON_FORMAT,
    version: 1,
    chains: table.chains,
    drawsPerChain: table.drawsPerChain,
    quantileLevels: table.quantileLevels,
    quantities: table.rows,
    notices: table.notices,
  };
}

/** JSON text; `indent` spaces (default 2; 0 for one line). */
export function summaryToJson(table: SummaryTable, indent = 2): string {
  return JSON.stringify(summaryToJsonValue(table), (_key, value: unknown) => (typeof value === 'number' && !Number.isFinite(value) ? null : value), indent);
}

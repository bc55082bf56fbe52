/**
 * The summary table computed from the draws: pooled mean, sd and quantiles here;
 * R-hat and ESS from @apsis/diagnostics.
 */
import type { SummaryRow } from '../input.js';
import { pool } from './columns.js';
import { findDiagnostic } from './diagnosticsLink.js';
import { meanAndSd, quantileSorted } from './quantile.js';

/** Which columns could be computed. */
export interface SummarySources {
  rhat: boolean;
  essBulk: boolean;
  essTail: boolean;
}

/**
 * One summary row per quantity. `byQuantity[j][c]` holds quantity j's draws in
 * chain c. MCSE of the mean comes from the diagnostics package; without it,
 * sd / √(bulk ESS) stands in (an approximation to sd / √(ESS of the mean);
 * common practice).
 */
export function summarise(names: readonly string[], byQuantity: readonly Float64Array[][]): { rows: SummaryRow[]; sources: SummarySources } {
  const rhat = findDiagnostic('splitRhat');
  const essBulk = findDiagnostic('bulkEss');
  const essTail = findDiagnostic('tailEss');
  const mcseMean = findDiagnostic('mcseOfMean');
  const rows = names.map((name, j) => {
    const chains = byQuantity[j];
    const all = pool(chains);
    const { mean, sd } = meanAndSd(all);
    const sorted = all.slice().sort();
    const row: SummaryRow = {
      name,
      mean,
      sd,
      q05: quantileSorted(sorted, 0.05),
      q50: quantileSorted(sorted, 0.5),
      q95: quantileSorted(sorted, 0.95),
    };
    const finite = (v: number | undefined) => (v !== undefined && Number.isFinite(v) ? v : undefined);
    row.rhat = finite(rhat?.(chains));
    row.essBulk = finite(essBulk?.(chains));
    row.essTail = finite(essTail?.(chains));
    row.mcseMean = finite(mcseMean?.(chains));
    if (row.mcseMean === undefined && row.essBulk !== undefined && row.essBulk > 0) row.mcseMean = sd / Math.sqrt(row.essBulk);
    return row;
  });
  return { rows, sources: { rhat: rhat !== undefined, essBulk: essBulk !== undefined, essTail: essTail !== undefined } };
}

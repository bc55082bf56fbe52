/**
 * The summary table and the warnings computed from the draws with
 * @apsis/diagnostics (rank-normalised split R-hat, bulk and tail ESS, MCSE of the
 * mean, sampler health; Vehtari et al. 2021, Betancourt 2016). Runs too short for
 * those diagnostics (fewer than MIN_DRAWS_PER_CHAIN draws per chain) still get a
 * pooled mean, sd and quantiles, with the diagnostic columns left empty.
 */
import {
  type DiagnosticWarning,
  DiagnosticsError,
  MIN_DRAWS_PER_CHAIN,
  type SummaryTable,
  convergenceWarnings,
  samplerHealth,
  summarize,
} from '@apsis/diagnostics';
import type { ChainStats, ReportWarning, SummaryRow } from '../input.js';
import { pool } from './columns.js';
import { meanAndSd, quantileSorted } from './quantile.js';

/** Quantile levels of the summary's three quantile columns. */
export const SUMMARY_QUANTILES = [0.05, 0.5, 0.95] as const;

export interface ComputedSummary {
  rows: SummaryRow[];
  /** The diagnostics package's own table, or undefined when the run was too short. */
  table?: SummaryTable;
  /** Why the diagnostic columns are empty, when they are. */
  missing?: string;
}

const orUndefined = (v: number | null): number | undefined => (v === null ? undefined : v);

/** Pooled mean, sd and quantiles only (no diagnostics). */
function plainRow(name: string, chains: readonly Float64Array[]): SummaryRow {
  const all = pool(chains);
  const { mean, sd } = meanAndSd(all);
  const sorted = all.slice().sort();
  return {
    name,
    mean,
    sd,
    q05: quantileSorted(sorted, 0.05),
    q50: quantileSorted(sorted, 0.5),
    q95: quantileSorted(sorted, 0.95),
  };
}

/**
 * One summary row per quantity. `byQuantity[j][c]` holds quantity j's draws in
 * chain c (all chains equally long, finite).
 */
export function summarise(names: readonly string[], byQuantity: readonly Float64Array[][]): ComputedSummary {
  const drawsPerChain = byQuantity[0]?.[0]?.length ?? 0;
  if (drawsPerChain < MIN_DRAWS_PER_CHAIN) {
    return {
      rows: names.map((n, j) => plainRow(n, byQuantity[j])),
      missing: `R-hat, ESS and MCSE need at least ${MIN_DRAWS_PER_CHAIN} draws per chain; this run has ${drawsPerChain}.`,
    };
  }
  let table: SummaryTable;
  try {
    table = summarize(
      names.map((name, j) => ({ name, chains: byQuantity[j] })),
      { quantiles: SUMMARY_QUANTILES },
    );
  } catch (error) {
    if (!(error instanceof DiagnosticsError)) throw error;
    return { rows: names.map((n, j) => plainRow(n, byQuantity[j])), missing: `The diagnostics could not be computed: ${error.message}` };
  }
  const rows = table.rows.map((r): SummaryRow => ({
    name: r.name,
    mean: r.mean,
    sd: r.sd,
    q05: r.quantiles[0].value,
    q50: r.quantiles[1].value,
    q95: r.quantiles[2].value,
    mcseMean: orUndefined(r.mcseMean),
    essBulk: orUndefined(r.bulkEss),
    essTail: orUndefined(r.tailEss),
    rhat: orUndefined(r.rhat),
  }));
  return { rows, table };
}

/** A diagnostics warning in the report's terms ('caution' is shown as a warning). */
export function fromDiagnosticWarning(w: DiagnosticWarning): ReportWarning {
  return {
    severity: w.severity === 'problem' ? 'problem' : 'warning',
    message: w.message,
    advice: w.advice,
    quantity: w.quantity ?? undefined,
  };
}

/**
 * Warnings with advice from @apsis/diagnostics for a summary table and, when
 * given, the sampler statistics (divergences, E-BFMI, tree-depth limit).
 */
export function computeWarnings(table: SummaryTable, stats: readonly ChainStats[] | undefined, maxTreeDepth?: number): ReportWarning[] {
  const health = stats && stats.length > 0 ? samplerHealth(stats, { maxTreeDepth }) : null;
  return convergenceWarnings(table, health).map(fromDiagnosticWarning);
}

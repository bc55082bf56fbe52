/**
 * The report's own checks, applied to the summary and the sampler statistics so
 * that problems are flagged even when no warnings were passed in. Thresholds from
 * Vehtari et al. (2021, Bayesian Analysis 16, 667, sec. 4.4: R-hat below 1.01,
 * bulk and tail ESS above 100 per chain) and Betancourt (2016, E-BFMI below 0.3;
 * common practice).
 */
import { DEFAULT_THRESHOLDS } from '@apsis/diagnostics';
import type { SummaryRow } from '../input.js';
import { formatCount, formatFixed } from '../format.js';
import type { ChainHealth } from './chainHealth.js';

/** The same thresholds as @apsis/diagnostics' warnings, so tables and warnings agree. */
export const RHAT_THRESHOLD = DEFAULT_THRESHOLDS.rhat;
export const ESS_PER_CHAIN = DEFAULT_THRESHOLDS.essPerChain;
export const EBFMI_THRESHOLD = DEFAULT_THRESHOLDS.ebfmi;

/** Plain-words flags for one summary row; empty when none. */
export function summaryFlags(row: SummaryRow, chains: number): string[] {
  const flags: string[] = [];
  const essMin = ESS_PER_CHAIN * chains;
  if (row.rhat !== undefined && row.rhat > RHAT_THRESHOLD) flags.push(`R-hat ${formatFixed(row.rhat, 3)} > ${RHAT_THRESHOLD}`);
  if (row.essBulk !== undefined && row.essBulk < essMin) flags.push(`bulk ESS ${formatCount(row.essBulk)} < ${essMin}`);
  if (row.essTail !== undefined && row.essTail < essMin) flags.push(`tail ESS ${formatCount(row.essTail)} < ${essMin}`);
  return flags;
}

/** Plain-words flags for one chain's sampler health; empty when none. */
export function chainFlags(h: ChainHealth): string[] {
  const flags: string[] = [];
  if (h.divergences !== undefined && h.divergences > 0) flags.push(`${h.divergences} divergent`);
  if (h.depthLimitHits !== undefined && h.depthLimitHits > 0) flags.push(`${h.depthLimitHits} at tree-depth limit`);
  if (h.ebfmi !== undefined && h.ebfmi < EBFMI_THRESHOLD) flags.push(`E-BFMI ${formatFixed(h.ebfmi, 2)} < ${EBFMI_THRESHOLD}`);
  return flags;
}

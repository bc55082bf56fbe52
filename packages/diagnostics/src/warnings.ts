import { z } from 'zod';
import { OptionError } from './errors.js';
import type { SamplerHealth } from './health.js';
import { CONSTANT_NOTE, type SummaryTable } from './summary.js';
import type { DiagnosticWarning } from './warningTypes.js';

/**
 * Plain-language warnings with advice, from a summary and (optionally) sampler health.
 *
 * Default thresholds and their sources:
 * - R-hat above 1.01: Vehtari et al. (2021, Bayesian Analysis 16, 667), their recommendation.
 * - bulk- or tail-ESS below 100 per chain (400 for four chains): Vehtari et al. (2021).
 * - any divergent transition: Betancourt (2017, arXiv:1701.02434), on divergences; common practice.
 * - E-BFMI below 0.3: Betancourt (2016, arXiv:1604.00695); the 0.3 cut is common practice.
 * - any draw at the maximum tree depth: common practice; an efficiency matter, so a caution.
 */
export interface WarningThresholds {
  /** R-hat above this is a problem (default 1.01). */
  rhat: number;
  /** Bulk- or tail-ESS below this times the number of chains is a problem (default 100). */
  essPerChain: number;
  /** E-BFMI below this is a problem (default 0.3). */
  ebfmi: number;
  /** A share of draws at the maximum tree depth above this is a caution (default 0). */
  treeDepthShare: number;
}

export const DEFAULT_THRESHOLDS: Readonly<WarningThresholds> = Object.freeze({ rhat: 1.01, essPerChain: 100, ebfmi: 0.3, treeDepthShare: 0 });

const thresholdsSchema = z
  .object({
    rhat: z.number().gt(1).finite(),
    essPerChain: z.number().nonnegative().finite(),
    ebfmi: z.number().nonnegative().finite(),
    treeDepthShare: z.number().min(0).max(1),
  })
  .partial();

/** Merges user thresholds over the defaults, validating them. */
export function resolveThresholds(thresholds: Partial<WarningThresholds> | undefined): WarningThresholds {
  const parsed = thresholdsSchema.safeParse(thresholds ?? {});
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const key = issue.path.map(String).join('.');
    const value = key === '' ? thresholds : (thresholds as Record<string, unknown>)[key];
    throw new OptionError(`thresholds.${key}`, `thresholds.${key}: ${issue.message}, got ${String(value)}`);
  }
  return { ...DEFAULT_THRESHOLDS, ...parsed.data };
}

function fmt(x: number, digits = 3): string {
  return Number.isInteger(x) ? String(x) : x.toFixed(digits);
}

const MORE_DRAWS = 'Run more draws (the ESS grows about in proportion), or improve mixing: a longer warmup for step-size and mass-matrix adaptation, or a reparameterisation that removes strong correlations or varying scales.';

/** Warnings about the quantities of a summary (R-hat, ESS, undefined values, truncated chains). */
export function summaryWarnings(summary: SummaryTable, thresholds?: Partial<WarningThresholds>): DiagnosticWarning[] {
  const t = resolveThresholds(thresholds);
  const out: DiagnosticWarning[] = [...summary.notices];
  const minEss = t.essPerChain * summary.chains;
  for (const row of summary.rows) {
    const q = row.name;
    const base = { quantity: q, chain: null };
    if (row.notes.includes(CONSTANT_NOTE)) {
      out.push({
        ...base,
        code: 'rhat-undefined',
        severity: 'caution',
        value: null,
        threshold: null,
        message: `R-hat of '${q}' is undefined: every draw has the same value (${row.mean}).`,
        advice: `If '${q}' should vary, the sampler is stuck: check the acceptance rate and the step size, and the initial values. If it is fixed by construction, leave it out of the check.`,
      });
      continue;
    }
    if (row.rhat === null && row.notes.some((n) => n.startsWith('R-hat infinite'))) {
      out.push({
        ...base,
        code: 'rhat-infinite',
        severity: 'problem',
        value: null,
        threshold: t.rhat,
        message: `R-hat of '${q}' is infinite: each chain stays at its own constant value, so the chains never mixed.`,
        advice: 'The sampler rejects every proposal. Check the log density and its gradient at the initial values, and try a smaller initial step size.',
      });
      continue;
    }
    if (row.rhat !== null && row.rhat > t.rhat) {
      out.push({
        ...base,
        code: 'rhat-high',
        severity: 'problem',
        value: row.rhat,
        threshold: t.rhat,
        message: `R-hat of '${q}' is ${fmt(row.rhat)}, above ${t.rhat}: the chains disagree about it (in location or in spread), so they have not mixed.`,
        advice: `Run longer chains with a longer warmup. If that does not help, look at the trace of '${q}' for chains stuck in different regions (several modes, or a hard geometry), and consider a reparameterisation or better initial values.`,
      });
    }
    if (row.bulkEss === null || row.tailEss === null) {
      out.push({
        ...base,
        code: 'ess-undefined',
        severity: 'caution',
        value: null,
        threshold: minEss,
        message: `The ESS of '${q}' is undefined (${row.notes.join('; ') || 'no variation within the split chains'}).`,
        advice: `'${q}' takes very few distinct values; summarise it by counts instead, or check that it is meant to be discrete.`,
      });
    }
    if (row.bulkEss !== null && row.bulkEss < minEss) {
      out.push({
        ...base,
        code: 'bulk-ess-low',
        severity: 'problem',
        value: row.bulkEss,
        threshold: minEss,
        message: `Bulk ESS of '${q}' is ${Math.round(row.bulkEss)}, below ${minEss} (${t.essPerChain} per chain): its mean and median are not yet reliable, nor is R-hat.`,
        advice: MORE_DRAWS,
      });
    }
    if (row.tailEss !== null && row.tailEss < minEss) {
      out.push({
        ...base,
        code: 'tail-ess-low',
        severity: 'problem',
        value: row.tailEss,
        threshold: minEss,
        message: `Tail ESS of '${q}' is ${Math.round(row.tailEss)}, below ${minEss} (${t.essPerChain} per chain): its 5% and 95% quantiles, hence its intervals, are not yet reliable.`,
        advice: MORE_DRAWS,
      });
    }
  }
  return out;
}

/** Warnings about the sampler's health (divergences, E-BFMI, tree depth). */
export function healthWarnings(health: SamplerHealth, thresholds?: Partial<WarningThresholds>): DiagnosticWarning[] {
  const t = resolveThresholds(thresholds);
  const out: DiagnosticWarning[] = [];
  if (health.totalDivergences !== null && health.totalDivergences > 0) {
    const perChain = health.chains.map((c) => `chain ${c.chain}: ${c.divergences}`).join(', ');
    out.push({
      code: 'divergences',
      severity: 'problem',
      quantity: null,
      chain: null,
      value: health.totalDivergences,
      threshold: 0,
      message: `${health.totalDivergences} of ${health.totalDraws} draws ended in a divergent trajectory (${perChain}): the sampler met curvature too sharp for its step size, so parts of the posterior may be missed and the draws biased.`,
      advice: 'Raise the target acceptance rate (for example 0.9 to 0.99) so the step size shrinks. If divergences remain, reparameterise (for example a non-centred form for hierarchical scales) or rescale the parameters.',
    });
  }
  for (const c of health.chains) {
    if (c.ebfmi !== null && c.ebfmi < t.ebfmi) {
      out.push({
        code: 'ebfmi-low',
        severity: 'problem',
        quantity: null,
        chain: c.chain,
        value: c.ebfmi,
        threshold: t.ebfmi,
        message: `E-BFMI of chain ${c.chain} is ${fmt(c.ebfmi)}, below ${t.ebfmi}: resampling the momentum barely changes the energy, so the chain explores the energy levels of the posterior slowly (often heavy tails).`,
        advice: 'Reparameterise toward lighter tails and similar scales, or lengthen the warmup so the mass matrix adapts better.',
      });
    }
    if (c.treeDepthShare !== null && c.treeDepthShare > t.treeDepthShare) {
      out.push({
        code: 'tree-depth-saturated',
        severity: 'caution',
        quantity: null,
        chain: c.chain,
        value: c.treeDepthShare,
        threshold: t.treeDepthShare,
        message: `${fmt(100 * c.treeDepthShare, 1)}% of the draws of chain ${c.chain} reached the maximum tree depth ${health.maxTreeDepth}: their trajectories were cut before turning back.`,
        advice: 'This costs efficiency, not correctness. Raise the maximum tree depth, or improve the metric (longer warmup, a dense mass matrix) or the parameterisation so shorter trajectories suffice.',
      });
    }
  }
  return out;
}

/** All warnings: summary first, then sampler health. */
export function convergenceWarnings(summary: SummaryTable, health?: SamplerHealth | null, thresholds?: Partial<WarningThresholds>): DiagnosticWarning[] {
  return [...summaryWarnings(summary, thresholds), ...(health ? healthWarnings(health, thresholds) : [])];
}

/** Warnings as text: one paragraph per warning, "Problem:" or "Caution:", then "What to do:". */
export function formatWarnings(warnings: readonly DiagnosticWarning[]): string {
  if (warnings.length === 0) return 'No warnings.\n';
  return (
    warnings
      .map((w) => `${w.severity === 'problem' ? 'Problem' : 'Caution'}: ${w.message}\n  What to do: ${w.advice}`)
      .join('\n\n') + '\n'
  );
}

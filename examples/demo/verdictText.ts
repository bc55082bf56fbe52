/**
 * The diagnostics verdict of the demo run in plain words: each check with its worst
 * value and the threshold it is held to (R-hat and ESS: Vehtari et al. 2021;
 * divergences: Betancourt 2017; E-BFMI: Betancourt 2016), then the verdict of
 * `@apsis/diagnostics` and, when something failed, its advice.
 */
import {
  DEFAULT_THRESHOLDS,
  type ConvergenceVerdict,
  type DiagnosticWarning,
  type SamplerHealth,
  type SummaryTable,
} from '@apsis/diagnostics';

function worst<T>(items: readonly T[], value: (x: T) => number | null, pick: 'max' | 'min'): { item: T; value: number } | null {
  let best: { item: T; value: number } | null = null;
  for (const item of items) {
    const v = value(item);
    if (v === null || !Number.isFinite(v)) continue;
    if (best === null || (pick === 'max' ? v > best.value : v < best.value)) best = { item, value: v };
  }
  return best;
}

/** What each kind of warning says, in a few words, for the grouped list. */
const headings: Record<string, string> = {
  'rhat-high': 'R-hat above the threshold',
  'rhat-infinite': 'R-hat infinite (chains stuck at different values)',
  'rhat-undefined': 'R-hat undefined (constant)',
  'bulk-ess-low': 'bulk ESS too low',
  'tail-ess-low': 'tail ESS too low',
  'ess-undefined': 'ESS undefined',
  'chains-truncated': 'chains of unequal length',
  divergences: 'divergent transitions',
  'ebfmi-low': 'E-BFMI low',
  'tree-depth-saturated': 'trajectories cut at the maximum tree depth',
};

/**
 * Warnings grouped by kind: one line naming every quantity (or chain) concerned with
 * its value, then the advice of `@apsis/diagnostics` once.
 */
function groupedWarnings(warnings: readonly DiagnosticWarning[]): string[] {
  const byCode = new Map<string, DiagnosticWarning[]>();
  for (const w of warnings) byCode.set(w.code, [...(byCode.get(w.code) ?? []), w]);
  const lines: string[] = [];
  for (const [code, list] of byCode) {
    const digits = (v: number): string => (code.includes('ess') ? v.toFixed(0) : code.startsWith('rhat') ? v.toFixed(3) : Number.isInteger(v) ? String(v) : v.toPrecision(3));
    const named = list
      .map((w) => [w.quantity ?? (w.chain !== null ? `chain ${w.chain}` : ''), w.value === null ? '' : digits(w.value)].filter((x) => x !== '').join(' '))
      .filter((x) => x !== '');
    const shown = named.length > 8 ? [...named.slice(0, 8), `and ${named.length - 8} more`] : named;
    const what = shown;
    const severity = list.some((w) => w.severity === 'problem') ? 'Problem' : 'Caution';
    lines.push(`${severity}: ${headings[code] ?? code}${what.length > 0 ? `: ${what.join(', ')}` : ''}.`);
    lines.push(`  What to do: ${list[0].advice}`);
  }
  return lines;
}

/** Lines describing each check, then the verdict and the two cautions of docs/convergence.md. */
export function verdictText(summary: SummaryTable, health: SamplerHealth, verdict: ConvergenceVerdict): string {
  const rows = summary.rows;
  const essWanted = DEFAULT_THRESHOLDS.essPerChain * summary.chains;
  const rhat = worst(rows, (r) => r.rhat, 'max');
  const bulk = worst(rows, (r) => r.bulkEss, 'min');
  const tail = worst(rows, (r) => r.tailEss, 'min');
  const ebfmi = worst(health.chains, (c) => c.ebfmi, 'min');
  const divergences = health.totalDivergences ?? 0;
  const depthHits = health.chains.reduce((s, c) => s + (c.treeDepthHits ?? 0), 0);
  const ok = (good: boolean): string => (good ? 'ok' : 'PROBLEM');
  const lines = [
    `Convergence checks over ${rows.length} quantities, ${summary.chains} chains × ${summary.drawsPerChain} draws:`,
    rhat
      ? `  R-hat (do the chains agree?): largest ${rhat.value.toFixed(3)} (${rhat.item.name}); wanted below ${DEFAULT_THRESHOLDS.rhat}. ${ok(rhat.value < DEFAULT_THRESHOLDS.rhat)}`
      : '  R-hat: not available',
    bulk && tail
      ? `  effective sample size: smallest bulk ${bulk.value.toFixed(0)} (${bulk.item.name}), smallest tail ${tail.value.toFixed(0)} (${tail.item.name}); wanted at least ${essWanted}. ${ok(bulk.value >= essWanted && tail.value >= essWanted)}`
      : '  effective sample size: not available',
    `  divergent transitions after warmup: ${divergences === 0 ? 'none' : divergences}. ${ok(divergences === 0)}`,
    ebfmi
      ? `  energy (E-BFMI): lowest ${ebfmi.value.toFixed(2)} (chain ${ebfmi.item.chain}); wanted above ${DEFAULT_THRESHOLDS.ebfmi}. ${ok(ebfmi.value >= DEFAULT_THRESHOLDS.ebfmi)}`
      : '  energy (E-BFMI): not available',
    `  trajectories cut at the maximum tree depth (${health.maxTreeDepth ?? '?'}): ${depthHits === 0 ? 'none' : `${depthHits} draws (slower, not wrong)`}.`,
    '',
    verdict.converged
      ? `Verdict: no check found a problem${verdict.warnings.length > 0 ? ` (${verdict.warnings.length} caution${verdict.warnings.length > 1 ? 's' : ''} below)` : ''}.`
      : `Verdict: NOT converged by these checks; do not use these draws for conclusions yet.`,
  ];
  lines.push(...groupedWarnings(verdict.warnings));
  lines.push(
    'Diagnostics can show a problem but cannot prove convergence, and the posterior',
    'depends on the priors stated (see docs/convergence.md).',
  );
  return lines.join('\n') + '\n';
}

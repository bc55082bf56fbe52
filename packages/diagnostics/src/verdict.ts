import type { SamplerHealth } from './health.js';
import type { SummaryTable } from './summary.js';
import type { DiagnosticWarning } from './warningTypes.js';
import { convergenceWarnings, type WarningThresholds } from './warnings.js';

/**
 * A yes/no verdict a command line can gate on. "Converged" here means only that no check
 * found a problem: diagnostics can reveal non-convergence but never prove convergence.
 */
export interface ConvergenceVerdict {
  /** True when no warning of severity `problem` (or, in strict mode, `caution`) was raised. */
  readonly converged: boolean;
  /** One sentence per failing warning (empty when converged). */
  readonly reasons: string[];
  /** Every warning found, problems and cautions. */
  readonly warnings: DiagnosticWarning[];
}

export interface VerdictOptions {
  thresholds?: Partial<WarningThresholds>;
  /** Fail on cautions too (tree-depth saturation, truncated chains, constant quantities). */
  strict?: boolean;
}

export function convergenceVerdict(summary: SummaryTable, health?: SamplerHealth | null, options: VerdictOptions = {}): ConvergenceVerdict {
  const warnings = convergenceWarnings(summary, health, options.thresholds);
  const failing = warnings.filter((w) => w.severity === 'problem' || options.strict === true);
  return { converged: failing.length === 0, reasons: failing.map((w) => w.message), warnings };
}

/** The verdict as text: a first line "Converged: yes" or "Converged: no", then the reasons. */
export function formatVerdict(verdict: ConvergenceVerdict): string {
  if (verdict.converged) {
    const cautions = verdict.warnings.length;
    return `Converged: yes (no check found a problem${cautions > 0 ? `; ${cautions} caution${cautions > 1 ? 's' : ''}` : ''}). Diagnostics can show a problem but cannot prove convergence.\n`;
  }
  return `Converged: no\n${verdict.reasons.map((r) => `  - ${r}`).join('\n')}\n`;
}

/**
 * Structured warnings: what was found, how bad, and what to do. `problem` means the draws
 * should not be trusted yet (the verdict fails); `caution` means worth a look (the verdict
 * fails on cautions only in strict mode).
 */
export type WarningCode =
  | 'rhat-high'
  | 'bulk-ess-low'
  | 'tail-ess-low'
  | 'rhat-undefined'
  | 'rhat-infinite'
  | 'ess-undefined'
  | 'chains-truncated'
  | 'divergences'
  | 'ebfmi-low'
  | 'tree-depth-saturated';

export type WarningSeverity = 'problem' | 'caution';

export interface DiagnosticWarning {
  readonly code: WarningCode;
  readonly severity: WarningSeverity;
  /** Quantity name, or null for run-level findings (divergences, energy, tree depth). */
  readonly quantity: string | null;
  /** Chain index for per-chain findings, else null. */
  readonly chain: number | null;
  /** The measured value (null when it is undefined). */
  readonly value: number | null;
  /** The threshold it was compared with (null when none applies). */
  readonly threshold: number | null;
  /** What was found, in plain words. */
  readonly message: string;
  /** What to do about it. */
  readonly advice: string;
}

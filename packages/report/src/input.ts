/**
 * The report's input: plain arrays and numbers, independent of how the run was
 * produced. Every field is checked by `validateReportInput` (see validate.ts).
 */

import type { DiagnosticWarning } from '@apsis/diagnostics';

/** A number[] or any typed array (Float64Array, Int32Array, Uint8Array, …). */
export type NumberArray = ArrayLike<number>;

/** What was run. Shown in the run table. */
export interface RunInfo {
  /** The run seed (number or string), so the run can be repeated. */
  seed: number | string;
  /** Number of chains; must equal quantities.chains.length. */
  chains: number;
  /** Warmup iterations per chain (not plotted). */
  warmup: number;
  /** Draws per chain that were asked for; the report plots what it is given. */
  draws: number;
  /** Sampling method, e.g. "NUTS" or "HMC". */
  method: string;
  /** Mass-matrix kind, e.g. "diagonal" or "dense". */
  metric?: string;
  /** Computation backend, e.g. "wasm" or "cpu". */
  backend?: string;
  /** Wall-clock time of the whole run, seconds. */
  elapsedSeconds?: number;
  /** Tree-depth limit of NUTS; draws that reached it are counted. */
  maxTreeDepth?: number;
  /** Target acceptance probability of step-size adaptation (0 to 1). */
  targetAcceptance?: number;
  /** Free-text notes, one paragraph each. */
  notes?: string[];
}

/** Posterior draws of named quantities (parameters and derived quantities). */
export interface QuantityDraws {
  /** Quantity names, in column order. Shown escaped; any text is allowed. */
  names: string[];
  /** Unit of each quantity by name, e.g. { period: 'd', K: 'm/s' }. */
  units?: Record<string, string>;
  /**
   * One array per chain, draws × names.length values in row-major order
   * (draw 0's values for every name, then draw 1's, …). All chains equally long.
   */
  chains: NumberArray[];
}

/** Sampler statistics of one chain, one entry per kept draw; every field optional. */
export interface ChainStats {
  /** 1 (or true) where the draw's trajectory diverged, else 0 (false). */
  divergent?: NumberArray | boolean[];
  /** NUTS tree depth of each draw. */
  treeDepth?: NumberArray;
  /** Hamiltonian (total energy) at each draw, in units of log density. */
  energy?: NumberArray;
  /** Integrator step size, in the sampler's unconstrained coordinates. */
  stepSize?: NumberArray;
  /** Acceptance statistic of each draw, 0 to 1. */
  acceptance?: NumberArray;
  /** Leapfrog steps taken for each draw. */
  leapfrogSteps?: NumberArray;
}

/** One row of the summary table; values in the quantity's own unit. */
export interface SummaryRow {
  name: string;
  mean: number;
  /** Posterior standard deviation. */
  sd: number;
  /** 5 %, 50 % and 95 % posterior quantiles. */
  q05: number;
  q50: number;
  q95: number;
  /** Monte Carlo standard error of the mean. */
  mcseMean?: number;
  /** Bulk and tail effective sample sizes (Vehtari et al. 2021). */
  essBulk?: number;
  essTail?: number;
  /** Rank-normalised split R-hat, the larger of bulk and folded (Vehtari et al. 2021). */
  rhat?: number;
}

/** How serious a warning is: a note to read, a warning to check, a problem to fix. */
export type Severity = 'note' | 'warning' | 'problem';

export interface ReportWarning {
  severity: Severity;
  /** What was found, in plain words. */
  message: string;
  /** What to do about it. */
  advice?: string;
  /** The quantity it concerns, if one (null or absent for run-level findings). */
  quantity?: string | null;
}

/**
 * A warning as the report takes it: its own shape, or @apsis/diagnostics'
 * DiagnosticWarning as it comes ('caution' is shown as a warning). The severity
 * words info, warn, error and critical are also accepted.
 */
export type WarningInput = ReportWarning | DiagnosticWarning;

/** Data points of one group (e.g. one instrument), in the panel's units. */
export interface FitGroup {
  label: string;
  x: NumberArray;
  y: NumberArray;
  /** One-sigma error bar on y (≥ 0); omit for none. */
  yErr?: NumberArray;
}

/** One posterior draw of the model curve; x increasing. */
export interface ModelCurve {
  x: NumberArray;
  y: NumberArray;
}

/**
 * A data-and-model panel, e.g. radial velocities or a light curve folded on a
 * period. The caller does the folding; the report only draws.
 */
export interface FitPanel {
  title: string;
  xLabel: string;
  /** Unit of x, e.g. 'd' or 'h from mid-transit'. */
  xUnit?: string;
  yLabel: string;
  /** Unit of y, e.g. 'm/s' or 'relative flux'. */
  yUnit?: string;
  groups: FitGroup[];
  /** Posterior model draws drawn as thin lines (thinned to limits.modelDraws). */
  modelDraws?: ModelCurve[];
  /** Residuals (data − model) per group, drawn in a panel below, same x and units. */
  residuals?: FitGroup[];
}

/** Bounds that keep a report small whatever the run length. */
export interface PlotLimits {
  /** Points per trace polyline (default 600). */
  tracePoints?: number;
  /** Scatter points per pair-plot cell (default 800). */
  pairPoints?: number;
  /** Model draws per fit panel (default 40). */
  modelDraws?: number;
  /** Points per model curve (default 240). */
  curvePoints?: number;
  /** Data points per group in a fit panel (default 4000); more are thinned evenly and the legend says so. */
  dataPoints?: number;
  /** Bins of the rank histograms (default: 20, fewer for short chains). */
  rankBins?: number;
}

export interface ReportInput {
  title: string;
  subtitle?: string;
  /** When the run or report was made: ISO 8601 text or a Date. */
  createdAt?: string | Date;
  run: RunInfo;
  quantities: QuantityDraws;
  /** One entry per chain, same length and order as quantities.chains. */
  stats?: ChainStats[];
  /** Summary rows; computed from the draws when absent. */
  summary?: SummaryRow[];
  /**
   * Warnings to show; when absent they are computed with @apsis/diagnostics from
   * the draws and statistics. Warnings from that package (DiagnosticWarning) can be
   * passed as they are: 'caution' is shown as a warning, extra fields are ignored.
   */
  warnings?: WarningInput[];
  /** Quantities for the pair plot (default: the first five, at most). */
  pairs?: string[];
  /** Data-and-model panels. */
  fits?: FitPanel[];
  limits?: PlotLimits;
}

/** The input after validation: warnings normalised to the report's own shape. */
export type ValidReportInput = Omit<ReportInput, 'warnings'> & { warnings?: ReportWarning[] };

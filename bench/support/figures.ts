/**
 * What a benchmark suite reports: named figures, some with a target, printed as one
 * table by bench/run-all.ts (or by a suite run on its own).
 */
import { pathToFileURL } from 'node:url';

/** A target a figure is checked against: value ≥ limit, value ≤ limit or value < limit. */
export interface FigureTarget {
  readonly op: '>=' | '<=' | '<';
  readonly limit: number;
}

/** One measured figure. */
export interface Figure {
  /** Group heading, e.g. "NUTS vs adaptive Metropolis". */
  readonly group: string;
  readonly name: string;
  readonly value: number;
  /** How to print the value: a unit suffix ("x", "ns", "%", "B/draw", "s") or '' for a plain number. */
  readonly unit: string;
  readonly digits?: number;
  readonly target?: FigureTarget;
  /** One line of context (what was compared, sizes, times). */
  readonly note?: string;
}

/** What a suite returns. */
export interface SuiteResult {
  readonly suite: string;
  readonly figures: Figure[];
  /** Extra lines printed under the table (tables of scaling, breakdowns). */
  readonly details: string[];
  /** Wall seconds the suite took. */
  readonly seconds: number;
}

/** Options every suite takes. */
export interface SuiteOptions {
  readonly quick: boolean;
}

/** PASS, MISS, or '' for a figure without a target. */
export function verdict(f: Figure): string {
  if (!f.target) return '';
  const { op, limit } = f.target;
  const ok = op === '>=' ? f.value >= limit : op === '<=' ? f.value <= limit : f.value < limit;
  return ok ? 'PASS' : 'MISS';
}

/** A number in a short fixed or exponential form. */
export function formatNumber(x: number, digits = 3): string {
  if (!Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  if (a !== 0 && (a >= 1e6 || a < 1e-3)) return x.toExponential(Math.max(1, digits - 1));
  if (a >= 100) return x.toFixed(0);
  return x.toPrecision(digits);
}

function formatValue(f: Figure): string {
  const v = formatNumber(f.value, f.digits ?? 3);
  return f.unit === '' ? v : f.unit === 'x' ? `${v}x` : `${v} ${f.unit}`;
}

function formatTarget(f: Figure): string {
  if (!f.target) return '';
  const l = formatNumber(f.target.limit, 3);
  const unit = f.unit === 'x' ? 'x' : f.unit === '' ? '' : ` ${f.unit}`;
  return `${f.target.op === '>=' ? '≥' : f.target.op === '<=' ? '≤' : '<'} ${l}${unit}`;
}

function pad(s: string, n: number): string {
  return s + ' '.repeat(Math.max(0, n - [...s].length));
}

/** The figures of several suites as one text table, grouped, with PASS/MISS beside targets. */
export function figureTable(results: readonly SuiteResult[]): string {
  const figures = results.flatMap((r) => r.figures);
  const rows = figures.map((f) => [f.name, formatValue(f), formatTarget(f), verdict(f)]);
  const widths = [0, 1, 2, 3].map((c) => Math.max(...rows.map((r) => [...r[c]].length), ['figure', 'measured', 'target', ''][c].length));
  const lines: string[] = [];
  let group = '';
  lines.push(`${pad('figure', widths[0])}  ${pad('measured', widths[1])}  ${pad('target', widths[2])}  result`);
  lines.push('-'.repeat(widths[0] + widths[1] + widths[2] + 14));
  figures.forEach((f, i) => {
    if (f.group !== group) {
      group = f.group;
      lines.push(`[${group}]`);
    }
    const r = rows[i];
    lines.push(`${pad(r[0], widths[0])}  ${pad(r[1], widths[1])}  ${pad(r[2], widths[2])}  ${r[3]}`.trimEnd());
    if (f.note) lines.push(`    ${f.note}`);
  });
  return lines.join('\n');
}

/** Prints one suite's figures and details. */
export function printSuite(result: SuiteResult): void {
  console.log(figureTable([result]));
  for (const d of result.details) console.log(d);
  console.log(`(${result.suite}: ${result.seconds.toFixed(1)} s)`);
}

/**
 * Runs a suite's `run` when its file is the entry point: with `--json` the result is
 * printed as one JSON line (for bench/run-all.ts), else as a table. `--quick` is passed on.
 */
export async function runIfMain(
  metaUrl: string,
  run: (options: SuiteOptions) => Promise<SuiteResult>,
): Promise<void> {
  if (metaUrl !== pathToFileURL(process.argv[1] ?? '').href) return;
  const quick = process.argv.includes('--quick');
  const result = await run({ quick });
  if (process.argv.includes('--json')) console.log(`APSIS-BENCH ${JSON.stringify(result)}`);
  else printSuite(result);
}

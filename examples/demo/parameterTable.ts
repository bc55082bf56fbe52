/**
 * The demo's parameter table: for each planet, the star and the instruments, the
 * posterior median with its central 68% interval (16% and 84% quantiles), the true
 * value the data were simulated from, and the per-quantity convergence figures
 * (R-hat, bulk ESS). Values are rounded to two significant digits of their
 * uncertainty, so a period known to 2e-4 days prints as 4.31236 (+0.00022 −0.00022).
 */
import type { QuantitySummary, SummaryTable } from '@apsis/diagnostics';

/** One line of the table: a trace column, shown under a readable label. */
export interface TableRow {
  /** Trace column name (e.g. `planetMass_b`). */
  readonly column: string;
  readonly label: string;
  /** Unit as printed. */
  readonly unit: string;
  /** Added to every value before printing (the reference epoch for times). */
  readonly shift?: number;
}

/** A titled group of rows. */
export interface TableSection {
  readonly title: string;
  readonly rows: readonly TableRow[];
}

/** Quantile levels the table needs from the summary (and the 99% interval of the truth check). */
export const TABLE_QUANTILES: readonly number[] = [0.005, 0.16, 0.5, 0.84, 0.995];

/** The sections of the demo's table, given the reference epoch of the model (BJD-like days). */
export function demoSections(epoch: number): TableSection[] {
  return [
    {
      title: 'Orvanne b (transiting; joint fit of velocities and light curve)',
      rows: [
        { column: 'period_b', label: 'orbital period', unit: 'd' },
        { column: 'tc_b', label: 'mid-transit time', unit: 'BJD', shift: epoch },
        { column: 'semiAmplitude_b', label: 'RV semi-amplitude K', unit: 'm/s' },
        { column: 'eccentricity_b', label: 'eccentricity', unit: '' },
        { column: 'radiusRatio_b', label: 'radius ratio Rp/R*', unit: '' },
        { column: 'impactParameter_b', label: 'impact parameter b', unit: 'R*' },
        { column: 'inclination_b', label: 'inclination', unit: 'deg' },
        { column: 'scaledSemiMajorAxis_b', label: 'a/R*', unit: '' },
        { column: 'totalDuration_b', label: 'transit duration T14', unit: 'h' },
        { column: 'planetMass_b', label: 'planet mass', unit: 'M_earth' },
        { column: 'planetMassJupiter_b', label: 'planet mass', unit: 'M_jup' },
        { column: 'planetRadius_b', label: 'planet radius', unit: 'R_earth' },
        { column: 'planetRadiusJupiter_b', label: 'planet radius', unit: 'R_jup' },
        { column: 'planetDensity_b', label: 'planet density', unit: 'g/cm^3' },
        { column: 'semiMajorAxis_b', label: 'semi-major axis', unit: 'au' },
      ],
    },
    {
      title: 'Orvanne c (radial velocities only)',
      rows: [
        { column: 'period_c', label: 'orbital period', unit: 'd' },
        { column: 'tc_c', label: 'time of conjunction', unit: 'BJD', shift: epoch },
        { column: 'semiAmplitude_c', label: 'RV semi-amplitude K', unit: 'm/s' },
        { column: 'eccentricity_c', label: 'eccentricity', unit: '' },
        { column: 'omega_c', label: 'argument of periastron', unit: 'deg' },
        { column: 'minimumMass_c', label: 'minimum mass m sin i', unit: 'M_earth' },
        { column: 'semiMajorAxis_c', label: 'semi-major axis', unit: 'au' },
      ],
    },
    {
      title: 'Orvanne (the star)',
      rows: [
        { column: 'starDensity', label: 'mean stellar density', unit: 'g/cm^3' },
        { column: 'starMass', label: 'mass (prior only)', unit: 'M_sun' },
        { column: 'starRadius', label: 'radius (prior only)', unit: 'R_sun' },
        { column: 'u1_tallowlight', label: 'limb darkening u1', unit: '' },
        { column: 'u2_tallowlight', label: 'limb darkening u2', unit: '' },
      ],
    },
    {
      title: 'Instruments',
      rows: [
        { column: 'offset_lanternfish', label: 'Lanternfish offset', unit: 'm/s' },
        { column: 'jitter_lanternfish', label: 'Lanternfish jitter', unit: 'm/s' },
        { column: 'offset_saltmarsh', label: 'Saltmarsh offset', unit: 'm/s' },
        { column: 'jitter_saltmarsh', label: 'Saltmarsh jitter', unit: 'm/s' },
        { column: 'baseline_tallowlight', label: 'Tallowlight baseline flux', unit: '' },
        { column: 'fluxJitter_tallowlight', label: 'Tallowlight jitter', unit: 'flux' },
      ],
    },
  ];
}

/** Decimals that give two significant digits of `spread` (at least 0, at most 12). */
export function decimalsFor(spread: number): number {
  if (!(spread > 0) || !Number.isFinite(spread)) return 3;
  return Math.min(12, Math.max(0, 1 - Math.floor(Math.log10(spread))));
}

function quantileOf(row: QuantitySummary, p: number): number {
  const q = row.quantiles.find((x) => Math.abs(x.probability - p) < 1e-12);
  if (!q) throw new RangeError(`summary of ${row.name} has no ${p} quantile: summarise with TABLE_QUANTILES`);
  return q.value;
}

/** The central interval at `level` (e.g. 0.99) of a summary row: [low, high]. */
export function centralInterval(row: QuantitySummary, level: number): [number, number] {
  return [quantileOf(row, (1 - level) / 2), quantileOf(row, (1 + level) / 2)];
}

const minus = '\u2212';
const signed = (x: number, d: number, sign: '+' | '-'): string => `${sign === '+' ? '+' : minus}${Math.abs(x).toFixed(d)}`;

/** The table as text; `truth` maps column names to the simulated true values (optional). */
export function formatParameterTable(
  summary: SummaryTable,
  sections: readonly TableSection[],
  truth: Readonly<Record<string, number>> = {},
): string {
  const byName = new Map(summary.rows.map((r) => [r.name, r]));
  const header = ['quantity', 'unit', 'median', '68% interval', 'true', 'R-hat', 'ESS'];
  const lines: string[][] = [];
  const titles = new Map<number, string>();
  for (const section of sections) {
    titles.set(lines.length, section.title);
    for (const r of section.rows) {
      const row = byName.get(r.column);
      if (!row) continue;
      const shift = r.shift ?? 0;
      const median = quantileOf(row, 0.5);
      const lo = quantileOf(row, 0.16) - median;
      const hi = quantileOf(row, 0.84) - median;
      const d = decimalsFor(Math.min(-lo, hi) > 0 ? Math.min(-lo, hi) : row.sd);
      const t = truth[r.column];
      lines.push([
        `  ${r.label}`,
        r.unit,
        (median + shift).toFixed(d),
        `${signed(hi, d, '+')} ${signed(lo, d, '-')}`,
        t === undefined ? '' : (t + shift).toFixed(d),
        row.rhat === null ? 'n/a' : row.rhat.toFixed(3),
        row.bulkEss === null ? 'n/a' : row.bulkEss.toFixed(0),
      ]);
    }
  }
  const widths = header.map((h, c) => Math.max(h.length, ...lines.map((l) => l[c].length)));
  const right = [false, false, true, false, true, true, true];
  const fmt = (cells: string[]): string =>
    cells
      .map((s, c) => (right[c] ? s.padStart(widths[c]) : s.padEnd(widths[c])))
      .join('  ')
      .trimEnd();
  const out = [fmt(header)];
  lines.forEach((l, i) => {
    const title = titles.get(i);
    if (title !== undefined) out.push(title);
    out.push(fmt(l));
  });
  return out.join('\n') + '\n';
}

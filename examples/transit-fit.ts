/**
 * Fitting a transit light curve: one planet, one photometer with 10-minute exposures
 * (so the model integrates over each exposure), limb darkening in the (q1, q2) form,
 * the stellar density as the geometric parameter. The data are simulated (an invented
 * star), so the true values are known and printed beside the posterior summary.
 *
 *   npx tsx --conditions=source examples/transit-fit.ts
 */
import { pathToFileURL } from 'node:url';
import { createRandomStream, runChains } from '@apsis/core';
import { summarizeDraws } from '@apsis/diagnostics';
import { createTransitModel, fitPanels, simulateLightCurve, type DataPanel, type LightCurveInput } from '@apsis/models';

/** Time origin of the invented observations (days). */
const ORIGIN = 2460000;
/** Exposure time of the photometer: 10 minutes, in days. */
const EXPOSURE = 10 / 1440;

/** The planet and star the light curve is drawn from. */
export const truth = {
  planet: { period: 3.8573, tc: ORIGIN + 0.915, radiusRatio: 0.095, impactParameter: 0.45 },
  starDensity: 1.6, // g/cm³
  u1: 0.42,
  u2: 0.2,
};

/** `transits` transits, observed for ±0.25 d around each mid-transit, one point per exposure. */
export function simulate(transits: number, seed: string): LightCurveInput {
  const { period, tc } = truth.planet;
  const times: number[] = [];
  for (let n = 0; n < transits; n++) {
    for (let t = tc + n * period - 0.25; t < tc + n * period + 0.25; t += EXPOSURE) times.push(t);
  }
  return simulateLightCurve(
    { label: 'cam', times, errors: 4e-4, exposureTime: EXPOSURE, planets: [truth.planet], starDensity: truth.starDensity, u1: truth.u1, u2: truth.u2 },
    createRandomStream(seed),
  ).data;
}

export interface TransitFitOptions {
  readonly transits?: number;
  readonly chains?: number;
  readonly warmup?: number;
  readonly draws?: number;
  readonly seed?: number;
  /** Print nothing. */
  readonly quiet?: boolean;
}

/** Posterior summary of one trace column. */
export interface ColumnSummary {
  readonly name: string;
  readonly unit: string;
  readonly mean: number;
  /** Central 99% interval. */
  readonly low: number;
  readonly high: number;
  /** Rank-normalised split R-hat; null for a constant column. */
  readonly rhat: number | null;
}

export async function main(options: TransitFitOptions = {}): Promise<{ summary: ColumnSummary[]; panels: DataPanel[]; divergences: number }> {
  const { transits = 12, chains = 4, warmup = 500, draws = 500, seed = 1, quiet = false } = options;
  const lightCurve = simulate(transits, `transit example ${seed}`);

  const model = await createTransitModel({
    lightCurves: [lightCurve], // carries its exposure time; 5 sub-samples by default
    // A period and a mid-transit time from a transit search.
    planets: [{ label: 'b', period: 3.8574, tc: ORIGIN + 0.914 }],
    // A stellar radius with its uncertainty, for the planet's radius.
    star: { radius: 0.93, radiusUncertainty: 0.03 },
  });
  if (!quiet) {
    console.log(`reference epoch ${model.epoch}; sampled parameters and priors:`);
    for (const p of model.parameters) console.log(`  ${p.names.join(', ')}: ${p.prior}`);
  }

  const result = await runChains(model, { chains, warmup, draws, seed });
  // Mean, central 99% interval and R-hat of every trace column.
  const { names, values } = result.outputs!;
  const table = summarizeDraws(values, { dim: names.length, names, quantiles: [0.005, 0.995] });
  const summary: ColumnSummary[] = table.rows.map((row) => ({
    name: row.name,
    unit: model.units[row.name],
    mean: row.mean,
    low: row.quantiles[0].value,
    high: row.quantiles[1].value,
    rhat: row.rhat,
  }));
  const panels = fitPanels(model, result, { maxDraws: 30 });
  const divergences = result.divergences.reduce((a, b) => a + b, 0);

  if (!quiet) {
    console.log(`\n${divergences} divergent transitions; column, mean, 99% interval, R-hat:`);
    for (const s of summary) {
      console.log(`  ${s.name.padEnd(22)} ${s.mean.toPrecision(6).padStart(12)} [${s.low.toPrecision(6)}, ${s.high.toPrecision(6)}] ${s.unit.padEnd(8)} ${s.rhat === null ? 'constant' : s.rhat.toFixed(3)}`);
    }
    console.log(`\npanels: ${panels.map((p) => p.title).join('; ')}`);
  }
  return { summary, panels, divergences };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}

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
import { summarizeDraws, type QuantitySummary } from '@apsis/diagnostics';
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

export async function main(options: TransitFitOptions = {}): Promise<{ summary: QuantitySummary[]; panels: DataPanel[]; divergences: number }> {
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
  // Mean, central 99% interval (quantiles 0.5% and 99.5%) and R-hat of every trace column.
  const { names, values } = result.outputs!;
  const summary = summarizeDraws(values, { dim: names.length, names, quantiles: [0.005, 0.995] }).rows;
  const panels = fitPanels(model, result, { maxDraws: 30 });
  const divergences = result.divergences.reduce((a, b) => a + b, 0);

  if (!quiet) {
    console.log(`\n${divergences} divergent transitions; column, mean, 99% interval, R-hat:`);
    for (const { name, mean, quantiles: [low, high], rhat } of summary) {
      const interval = `[${low.value.toPrecision(6)}, ${high.value.toPrecision(6)}]`;
      console.log(`  ${name.padEnd(22)} ${mean.toPrecision(6).padStart(12)} ${interval} ${model.units[name].padEnd(8)} ${rhat === null ? 'constant' : rhat.toFixed(3)}`);
    }
    console.log(`\npanels: ${panels.map((p) => p.title).join('; ')}`);
  }
  return { summary, panels, divergences };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}

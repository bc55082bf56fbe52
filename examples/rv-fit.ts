/**
 * Fitting radial velocities: two planets seen by two spectrographs, each with its own
 * offset and jitter. The data are simulated (an invented star), so the true values are
 * known and printed beside the posterior summary.
 *
 *   npx tsx --conditions=source examples/rv-fit.ts
 */
import { pathToFileURL } from 'node:url';
import { createRandomStream, priors, runChains } from '@apsis/core';
import { summarizeDraws, type QuantitySummary } from '@apsis/diagnostics';
import { createRvModel, fitPanels, simulateRadialVelocities, type DataPanel, type RvDataInput } from '@apsis/models';

/** Time origin of the invented observations (days, in the data's own time system). */
const ORIGIN = 2460000;

/** The system the data are drawn from (angles in degrees, velocities in m/s). */
export const truth = {
  planets: [
    { label: 'b', period: 4.2317, tc: ORIGIN + 1.37, eccentricity: 0.12, omega: 65, semiAmplitude: 28 },
    { label: 'c', period: 21.9, tc: ORIGIN + 8.4, eccentricity: 0.28, omega: -120, semiAmplitude: 11 },
  ],
  offsets: { north: -12.5, south: 31.0 },
  jitters: { north: 1.8, south: 3.2 },
};

/** `points` velocities over 400 days, two in three from the 'north' spectrograph. */
export function simulate(points: number, seed: string): RvDataInput {
  const stream = createRandomStream(seed);
  const times = Array.from({ length: points }, () => ORIGIN + 400 * stream.uniform()).sort((a, b) => a - b);
  const instrument = times.map((_, i) => (i % 3 === 2 ? 'south' : 'north'));
  const errors = instrument.map((label) => (label === 'north' ? 1.5 : 2.5));
  return simulateRadialVelocities({ times, instrument, errors, planets: truth.planets, offsets: truth.offsets, jitters: truth.jitters }, stream).data;
}

export interface RvFitOptions {
  readonly points?: number;
  readonly chains?: number;
  readonly warmup?: number;
  readonly draws?: number;
  readonly seed?: number;
  /** Print nothing. */
  readonly quiet?: boolean;
}

export async function main(options: RvFitOptions = {}): Promise<{ summary: QuantitySummary[]; panels: DataPanel[]; epoch: number; divergences: number }> {
  const { points = 80, chains = 4, warmup = 1000, draws = 1000, seed = 1, quiet = false } = options;
  const data = simulate(points, `rv example ${seed}`);

  const model = await createRvModel({
    rv: data,
    // Periods as a periodogram would give them; tc and K are estimated from the data.
    planets: [
      { label: 'b', period: 4.232 },
      { label: 'c', period: 21.85 },
    ],
    // A stellar mass with its uncertainty, for minimum masses and semi-major axes.
    star: { mass: 0.92, massUncertainty: 0.04 },
    // Any default prior can be replaced by name.
    priors: { jitter_south: priors.halfNormal(5) },
  });
  if (!quiet) {
    console.log(`reference epoch ${model.epoch}; sampled parameters and priors:`);
    for (const p of model.parameters) console.log(`  ${p.names.join(', ')}: ${p.prior}`);
  }

  const result = await runChains(model, { chains, warmup, draws, seed });
  // Mean, central 99% interval (quantiles 0.5% and 99.5%) and R-hat of every trace column.
  const { names, values } = result.outputs!;
  const summary = summarizeDraws(values, { dim: names.length, names, quantiles: [0.005, 0.995] }).rows;
  // Data and model curves for a report (`fits` of @apsis/report).
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
  return { summary, panels, epoch: model.epoch, divergences };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}

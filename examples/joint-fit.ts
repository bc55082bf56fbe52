/**
 * A joint fit of radial velocities and a light curve: planet b transits and is seen by
 * both kinds of data, which share its period, mid-transit time, eccentricity and
 * argument of periastron; planet c is seen in the radial velocities only. Two
 * spectrographs, one photometer with 2-minute exposures, a star with a known mass and
 * radius. The data are simulated (an invented system), so the true values are known.
 *
 *   npx tsx --conditions=source examples/joint-fit.ts
 */
import { pathToFileURL } from 'node:url';
import { createRandomStream, runChains } from '@apsis/core';
import { summarizeDraws, type QuantitySummary } from '@apsis/diagnostics';
import {
  createJointModel,
  fitPanels,
  simulateLightCurve,
  simulateRadialVelocities,
  type DataPanel,
  type LightCurveInput,
  type RvDataInput,
} from '@apsis/models';

/** Time origin of the invented observations (days). */
const ORIGIN = 2460000;

/** The system the data are drawn from (angles in degrees). */
export const truth = {
  b: { period: 4.2317, tc: ORIGIN + 1.37, eccentricity: 0.08, omega: 40, semiAmplitude: 31, radiusRatio: 0.1, impactParameter: 0.3 },
  c: { period: 21.9, tc: ORIGIN + 8.4, eccentricity: 0.2, omega: -120, semiAmplitude: 12 },
  offsets: { north: -12.5, south: 31.0 },
  jitters: { north: 1.8, south: 3.2 },
  star: { mass: 0.92, radius: 0.87, density: 1.97 }, // M_sun, R_sun, g/cm³
  limbDarkening: { u1: 0.45, u2: 0.2 },
};

/** Radial velocities over 300 days and a light curve of `transits` transits of b. */
export function simulate(points: number, transits: number, seed: string): { rv: RvDataInput; lightCurve: LightCurveInput } {
  const stream = createRandomStream(seed);
  const times = Array.from({ length: points }, () => ORIGIN + 300 * stream.uniform()).sort((a, b) => a - b);
  const instrument = times.map((_, i) => (i % 3 === 2 ? 'south' : 'north'));
  const errors = instrument.map((label) => (label === 'north' ? 1.5 : 2.5));
  const rv = simulateRadialVelocities({ times, instrument, errors, planets: [truth.b, truth.c], offsets: truth.offsets, jitters: truth.jitters }, stream).data;
  const exposure = 2 / 1440;
  const lcTimes: number[] = [];
  for (let n = 0; n < transits; n++) {
    const mid = truth.b.tc + 3 * n * truth.b.period; // every third transit was observed
    for (let t = mid - 0.15; t < mid + 0.15; t += exposure) lcTimes.push(t);
  }
  const lightCurve = simulateLightCurve(
    { label: 'cam', times: lcTimes, errors: 8e-4, exposureTime: exposure, planets: [truth.b], starDensity: truth.star.density, ...truth.limbDarkening },
    stream,
  ).data;
  return { rv, lightCurve };
}

export interface JointFitOptions {
  readonly points?: number;
  readonly transits?: number;
  readonly chains?: number;
  readonly warmup?: number;
  readonly draws?: number;
  readonly seed?: number;
  /** Print nothing. */
  readonly quiet?: boolean;
}

export async function main(options: JointFitOptions = {}): Promise<{ summary: QuantitySummary[]; panels: DataPanel[]; epoch: number; divergences: number }> {
  const { points = 60, transits = 4, chains = 4, warmup = 500, draws = 500, seed = 1, quiet = false } = options;
  const { rv, lightCurve } = simulate(points, transits, `joint example ${seed}`);

  const model = await createJointModel({
    rv,
    lightCurves: [lightCurve],
    planets: [
      { label: 'b', period: 4.2318, tc: ORIGIN + 1.371 },
      // Seen in the radial velocities only: no radius ratio or impact parameter.
      { label: 'c', period: 21.85, tc: ORIGIN + 8.0, transiting: false },
    ],
    // Mass and radius with uncertainties: true masses, radii, densities in the trace.
    star: { mass: 0.92, massUncertainty: 0.04, radius: 0.87, radiusUncertainty: 0.03 },
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
  return { summary, panels, epoch: model.epoch, divergences };
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}

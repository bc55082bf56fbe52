/**
 * Simulates the demo's observations from the invented scenario (`scenario.ts`) with a
 * fixed seed: the same data on every run, with no data files shipped. The noise and
 * the models come from `@apsis/models`' simulation helpers, which integrate the light
 * curve over each 30-minute exposure finely.
 */
import { createRandomStream, type RandomStream } from '@apsis/core';
import { simulateLightCurve, simulateRadialVelocities, type LightCurveInput, type RvDataInput } from '@apsis/models';
import { dataSeed, densityFromMassRadius, photometer, planets, seasons, spectrographs, star } from './scenario.js';

/** The demo's data, ready for the joint model builder, with the noiseless truth. */
export interface DemoObservations {
  readonly rv: RvDataInput;
  readonly lightCurve: LightCurveInput;
  /** The true velocity and flux at each data point (before noise). */
  readonly noiseless: { readonly rv: Float64Array; readonly flux: Float64Array };
}

/** `count` distinct whole nights in [first, last], each observed at a random time of night. */
function nightsIn(stream: RandomStream, first: number, last: number, count: number): number[] {
  const nights = new Set<number>();
  const span = Math.floor(last - first) + 1;
  while (nights.size < Math.min(count, span)) nights.add(Math.floor(first + span * stream.uniform()));
  // Observed between about 2 and 8 hours after the night's start.
  return [...nights].sort((a, b) => a - b).map((n) => n + 0.08 + 0.25 * stream.uniform());
}

/** Mid-exposure times of the light curve: one every exposure time, except in the gap. */
function lightCurveTimes(): Float64Array {
  const out: number[] = [];
  const count = Math.floor((photometer.end - photometer.start) / photometer.exposureTime);
  for (let i = 0; i <= count; i++) {
    const t = photometer.start + i * photometer.exposureTime;
    if (t < photometer.gap[0] || t > photometer.gap[1]) out.push(t);
  }
  return Float64Array.from(out);
}

/** The demo's radial velocities and light curve, simulated from the scenario's truth. */
export function simulateObservations(seed: string = dataSeed): DemoObservations {
  const stream = createRandomStream(seed);

  const rvPoints: { t: number; label: string; error: number }[] = [];
  for (const s of spectrographs) {
    for (const [first, last] of seasons) {
      for (const t of nightsIn(stream, first, last, s.nightsPerSeason)) {
        const [lo, hi] = s.errorRange;
        rvPoints.push({ t, label: s.label, error: lo + (hi - lo) * stream.uniform() });
      }
    }
  }
  rvPoints.sort((a, b) => a.t - b.t);
  const rv = simulateRadialVelocities(
    {
      times: rvPoints.map((p) => p.t),
      instrument: rvPoints.map((p) => p.label),
      errors: rvPoints.map((p) => p.error),
      planets: planets.map((p) => ({ period: p.period, tc: p.tc, eccentricity: p.eccentricity, omega: p.omega, semiAmplitude: p.semiAmplitude })),
      offsets: Object.fromEntries(spectrographs.map((s) => [s.label, s.offset])),
      jitters: Object.fromEntries(spectrographs.map((s) => [s.label, s.jitter])),
    },
    stream,
  );

  const transiting = planets.filter((p) => p.transiting);
  const lightCurve = simulateLightCurve(
    {
      label: photometer.label,
      times: lightCurveTimes(),
      errors: photometer.error,
      exposureTime: photometer.exposureTime,
      planets: transiting.map((p) => ({
        period: p.period,
        tc: p.tc,
        eccentricity: p.eccentricity,
        omega: p.omega,
        radiusRatio: p.radiusRatio,
        impactParameter: p.impactParameter,
      })),
      starDensity: densityFromMassRadius(star.mass, star.radius),
      u1: photometer.u1,
      u2: photometer.u2,
      baseline: photometer.baseline,
      jitter: photometer.jitter,
    },
    stream,
  );

  return { rv: rv.data, lightCurve: lightCurve.data, noiseless: { rv: rv.noiseless, flux: lightCurve.noiseless } };
}

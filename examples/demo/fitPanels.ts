/**
 * Fit panels of the demo report: the radial velocities folded on each planet's
 * orbit, with the other planet's signal and each spectrograph's offset removed, and
 * the light curve folded on planet b's transits; each with posterior model draws and
 * the residuals (data minus the model at the posterior medians).
 *
 * The models come from the float64 kernels of `@apsis/models`. A folded RV curve
 * depends on time only through the phase (t − tc)/P, so the curves are drawn on a grid
 * of phase with P = 1 and tc = 0. Transit curves are averaged over the photometer's
 * 30-minute exposures exactly as in the fit, so the drawn shape is the smeared one the
 * data show.
 */
import type { RunResult } from '@apsis/core';
import { createLightCurveKernel, createRvCurveKernel, type PlanetSystemModel } from '@apsis/models';
import type { FitGroup, FitPanel, ModelCurve } from '@apsis/report';
import { photometer, spectrographs } from './scenario.js';
import type { DemoObservations } from './simulateObservations.js';

const RAD = Math.PI / 180;
/** Model draws per panel. */
const DRAWS = 40;
/** Points per model curve. */
const CURVE_POINTS = 240;
/** Half-width of the transit panel, hours from mid-transit. */
const TRANSIT_HALF_WIDTH_HOURS = 4.5;
/** Sub-samples per exposure of the drawn transit model (2 minutes each, as in the fit). */
const SUB_SAMPLES = 15;

/** Named values of one recorded draw. */
type Draw = Readonly<Record<string, number>>;

/** Posterior medians of every recorded column, and `count` draws spread evenly over all chains. */
function posteriorPicks(run: RunResult, count: number): { medians: Draw; draws: Draw[] } {
  const outputs = run.outputs;
  if (!outputs) throw new Error('fit panels: the run has no recorded outputs');
  const width = outputs.names.length;
  const rows = outputs.values.map((v) => v.length / width);
  const total = rows.reduce((a, b) => a + b, 0);
  const row = (k: number): Draw => {
    let c = 0;
    while (k >= rows[c]) k -= rows[c++];
    const v = outputs.values[c];
    return Object.fromEntries(outputs.names.map((n, j) => [n, v[k * width + j]]));
  };
  const medians: Record<string, number> = {};
  outputs.names.forEach((n, j) => {
    const column = Float64Array.from({ length: total }, (_, k) => {
      let c = 0;
      let i = k;
      while (i >= rows[c]) i -= rows[c++];
      return outputs.values[c][i * width + j];
    }).sort();
    const h = (total - 1) / 2;
    medians[n] = 0.5 * (column[Math.floor(h)] + column[Math.ceil(h)]);
  });
  const draws = Array.from({ length: Math.min(count, total) }, (_, i) => row(Math.floor(((i + 0.5) * total) / Math.min(count, total))));
  return { medians, draws };
}

/** One planet's slots [P, tc, e, ω (rad), K] of the RV kernel, from named values. */
function rvSlots(v: Draw, label: string, foldedPhase = false): Float64Array {
  const e = v[`eccentricity_${label}`] ?? 0;
  const w = (v[`omega_${label}`] ?? 90) * RAD;
  return Float64Array.of(foldedPhase ? 1 : v[`period_${label}`], foldedPhase ? 0 : v[`tc_${label}`], e, w, v[`semiAmplitude_${label}`]);
}

/** Phase in [−0.5, 0.5) of time t (days since the epoch) for a period and conjunction time. */
function phaseOf(t: number, period: number, tc: number): number {
  const x = (t - tc) / period;
  return x - Math.round(x);
}

/** The RV panels, one per planet. */
function rvPanels(model: PlanetSystemModel, observations: DemoObservations, medians: Draw, draws: readonly Draw[]): FitPanel[] {
  const labels = ['b', 'c'];
  const times = Float64Array.from(observations.rv.times, (t) => t - model.epoch);
  const values = Float64Array.from(observations.rv.values);
  const errors = Float64Array.from(observations.rv.errors);
  const labelOf = (i: number): string => (typeof observations.rv.instrument === 'string' ? observations.rv.instrument : observations.rv.instrument[i]);
  const n = times.length;

  // Each planet's velocity at the data times, at the posterior medians.
  const kernel = createRvCurveKernel({ times, planets: 1 });
  const signal = labels.map((l) => {
    const out = new Float64Array(n);
    kernel.value(rvSlots(medians, l), out);
    return out;
  });
  const offset = (i: number): number => medians[`offset_${labelOf(i)}`];
  const jitter = (i: number): number => medians[`jitter_${labelOf(i)}`];
  const residual = Float64Array.from({ length: n }, (_, i) => values[i] - offset(i) - signal[0][i] - signal[1][i]);

  const grid = Float64Array.from({ length: CURVE_POINTS }, (_, k) => -0.5 + k / (CURVE_POINTS - 1));
  const gridKernel = createRvCurveKernel({ times: grid, planets: 1 });

  return labels.map((label, p) => {
    const other = signal[1 - p];
    const phase = Float64Array.from(times, (t) => phaseOf(t, medians[`period_${label}`], medians[`tc_${label}`]));
    const groups: FitGroup[] = [];
    const residuals: FitGroup[] = [];
    for (const s of spectrographs) {
      const idx = [...Array(n).keys()].filter((i) => labelOf(i) === s.label);
      groups.push({
        label: s.name,
        x: idx.map((i) => phase[i]),
        y: idx.map((i) => values[i] - offset(i) - other[i]),
        yErr: idx.map((i) => Math.hypot(errors[i], jitter(i))),
      });
      residuals.push({ label: s.name, x: idx.map((i) => phase[i]), y: idx.map((i) => residual[i]), yErr: idx.map((i) => Math.hypot(errors[i], jitter(i))) });
    }
    const modelDraws: ModelCurve[] = draws.map((d) => {
      const y = new Float64Array(CURVE_POINTS);
      gridKernel.value(rvSlots(d, label, true), y);
      return { x: grid, y };
    });
    return {
      title: `Radial velocities folded on planet ${label} (P = ${medians[`period_${label}`].toFixed(4)} d), planet ${labels[1 - p]} and instrument offsets removed`,
      xLabel: `orbital phase of ${label} from conjunction`,
      yLabel: 'radial velocity',
      yUnit: 'm/s',
      groups,
      modelDraws,
      residuals,
    };
  });
}

/** Light-curve slots [P, tc, e, ω, a/R*, b, k, u1, u2] of planet b, with tc replaced. */
function transitSlots(v: Draw, tc: number): Float64Array {
  return Float64Array.of(
    v.period_b,
    tc,
    v.eccentricity_b ?? 0,
    (v.omega_b ?? 90) * RAD,
    v.scaledSemiMajorAxis_b,
    v.impactParameter_b,
    v.radiusRatio_b,
    v[`u1_${photometer.label}`],
    v[`u2_${photometer.label}`],
  );
}

/** The transit panel of planet b. */
function transitPanel(model: PlanetSystemModel, observations: DemoObservations, medians: Draw, draws: readonly Draw[]): FitPanel {
  const lc = observations.lightCurve;
  const P = medians.period_b;
  const tc = medians.tc_b;
  const baseline = medians[`baseline_${photometer.label}`];
  const jitter = medians[`fluxJitter_${photometer.label}`];
  const hours: number[] = [];
  const flux: number[] = [];
  const errs: number[] = [];
  const rawTimes = Float64Array.from(lc.times);
  const rawFlux = Float64Array.from(lc.flux);
  const rawErr = Float64Array.from(lc.errors);
  for (let i = 0; i < rawTimes.length; i++) {
    const h = 24 * P * phaseOf(rawTimes[i] - model.epoch, P, tc);
    if (Math.abs(h) > TRANSIT_HALF_WIDTH_HOURS) continue;
    hours.push(h);
    flux.push(rawFlux[i] / baseline);
    errs.push(Math.hypot(rawErr[i], jitter) / baseline);
  }
  const exposure = { exposureTime: photometer.exposureTime, subSamples: SUB_SAMPLES, planets: 1 } as const;
  const atData = createLightCurveKernel({ ...exposure, times: Float64Array.from(hours, (h) => h / 24) });
  const fitted = atData.flux(transitSlots(medians, 0), new Float64Array(hours.length));
  const grid = Float64Array.from({ length: CURVE_POINTS }, (_, k) => -TRANSIT_HALF_WIDTH_HOURS + (2 * TRANSIT_HALF_WIDTH_HOURS * k) / (CURVE_POINTS - 1));
  const atGrid = createLightCurveKernel({ ...exposure, times: Float64Array.from(grid, (h) => h / 24) });
  const modelDraws: ModelCurve[] = draws.map((d) => ({ x: grid, y: atGrid.flux(transitSlots(d, 0), new Float64Array(CURVE_POINTS)) }));
  return {
    title: `Light curve folded on the transits of planet b; model averaged over the ${Math.round(photometer.exposureTime * 1440)}-minute exposures`,
    xLabel: 'time from mid-transit',
    xUnit: 'h',
    yLabel: 'flux / baseline',
    groups: [{ label: photometer.name, x: hours, y: flux, yErr: errs }],
    modelDraws,
    residuals: [{ label: photometer.name, x: hours, y: flux.map((f, i) => f - fitted[i]), yErr: errs }],
  };
}

/** The three fit panels of the demo report. */
export function demoFitPanels(model: PlanetSystemModel, run: RunResult, observations: DemoObservations): FitPanel[] {
  const { medians, draws } = posteriorPicks(run, DRAWS);
  return [transitPanel(model, observations, medians, draws), ...rvPanels(model, observations, medians, draws)];
}

/**
 * Data-and-model panels for reports, from a built model and posterior draws, as plain
 * arrays in the shape `@apsis/report` takes (`FitPanel`, `FitGroup`, `ModelCurve`):
 *
 * - radial velocities against time, offsets (and nothing else) removed;
 * - per planet, radial velocities folded on its period (phase 0 at conjunction), with
 *   the instrument offsets, the trend and the other planets' signals removed;
 * - per transiting planet and light curve, the flux against hours from mid-transit,
 *   normalised by the baseline, undiluted, with the other planets' transits removed.
 *
 * Data are corrected and folded with a reference draw: the given draw with the highest
 * log-density. Model curves are drawn for at most `maxDraws` draws spread evenly over
 * the chains, each with its own ephemeris. Residuals are data minus the reference
 * draw's full model. Units: days, m/s, hours, relative flux.
 */
import { z } from 'zod';
import { createRvCurveKernel } from '../orbit/rvCurve.js';
import { createLightCurveKernel } from '../transit/lightCurve.js';
import { FitSettingsError } from './errors.js';
import type { PlanetSystemModel } from './planetModel.js';

/** Data points of one group (one instrument or light curve), in the panel's units. */
export interface PanelGroup {
  label: string;
  x: Float64Array;
  y: Float64Array;
  /** One-sigma error bars: the measurement errors with the reference draw's jitter added. */
  yErr?: Float64Array;
}

/** One posterior draw of the model curve, x increasing. */
export interface PanelCurve {
  x: Float64Array;
  y: Float64Array;
}

/** A data-and-model panel (the report's `FitPanel`). */
export interface DataPanel {
  title: string;
  xLabel: string;
  xUnit?: string;
  yLabel: string;
  yUnit?: string;
  groups: PanelGroup[];
  modelDraws?: PanelCurve[];
  residuals?: PanelGroup[];
}

/** Options of {@link fitPanels}. */
export interface FitPanelOptions {
  /** Largest number of model curves per panel (default 40). */
  maxDraws?: number;
  /** Points per model curve (default 240). */
  curvePoints?: number;
  /** Half-width of transit panels, hours (default 1.5 × the longest total duration of the reference draw). */
  transitWindowHours?: number;
}

/** Posterior draws: `runChains`' result (draws per chain, optional statistics), or positions. */
export type PanelDraws =
  | { readonly draws: readonly Float64Array[]; readonly stats?: readonly { readonly logDensity?: ArrayLike<number> }[] }
  | readonly Float64Array[];

const optionsSchema = z.strictObject({
  maxDraws: z.number().int().min(1).max(10000).optional(),
  curvePoints: z.number().int().min(2).max(100000).optional(),
  transitWindowHours: z.number().positive().optional(),
});

function positionsOf(model: PlanetSystemModel, draws: PanelDraws): { positions: Float64Array[]; logDensity: number[] } {
  const dim = model.dim;
  const positions: Float64Array[] = [];
  const logDensity: number[] = [];
  if (Array.isArray(draws)) {
    for (const [i, x] of (draws as readonly Float64Array[]).entries()) {
      if (!(x instanceof Float64Array) || x.length !== dim) throw new FitSettingsError(`draws[${i}]`, x, `a Float64Array of length ${dim}`);
      positions.push(x);
      logDensity.push(NaN);
    }
  } else {
    const r = draws as Exclude<PanelDraws, readonly Float64Array[]>;
    if (!r || !Array.isArray(r.draws)) throw new FitSettingsError('draws', draws, 'a runChains result or an array of positions');
    for (const [c, chain] of r.draws.entries()) {
      if (!(chain instanceof Float64Array) || chain.length % dim !== 0) throw new FitSettingsError(`draws.draws[${c}]`, chain, `a Float64Array of draws × ${dim} values`);
      const lp = r.stats?.[c]?.logDensity;
      for (let i = 0; i < chain.length / dim; i++) {
        positions.push(chain.subarray(i * dim, (i + 1) * dim));
        logDensity.push(lp ? lp[i] : NaN);
      }
    }
  }
  if (positions.length === 0) throw new FitSettingsError('draws', 0, 'at least one draw');
  return { positions, logDensity };
}

function grid(lo: number, hi: number, n: number): Float64Array {
  const g = new Float64Array(n);
  for (let i = 0; i < n; i++) g[i] = lo + ((hi - lo) * i) / (n - 1);
  return g;
}

/** Wraps x into [−0.5, 0.5). */
function wrapPhase(x: number): number {
  return x - Math.floor(x + 0.5);
}

/**
 * Data-and-model panels for a built model and posterior draws (see the file notes).
 * The result can be passed as `fits` to the report.
 */
export function fitPanels(model: PlanetSystemModel, draws: PanelDraws, options: FitPanelOptions = {}): DataPanel[] {
  const parsed = optionsSchema.safeParse(options);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const key = issue.code === 'unrecognized_keys' ? issue.keys[0] : String(issue.path[0]);
    throw new FitSettingsError(`options.${key}`, (options as Record<string, unknown>)[key], issue.code === 'unrecognized_keys' ? 'one of maxDraws, curvePoints, transitWindowHours' : issue.message);
  }
  const maxDraws = options.maxDraws ?? 40;
  const nCurve = options.curvePoints ?? 240;
  const { system, plan, likelihood } = model.structure;
  const { layout } = plan;
  const { positions, logDensity } = positionsOf(model, draws);

  // Reference draw: highest log-density.
  let best = 0;
  let bestLp = -Infinity;
  const g = new Float64Array(model.dim);
  for (let i = 0; i < positions.length; i++) {
    const lp = Number.isFinite(logDensity[i]) ? logDensity[i] : model.logDensityGrad(positions[i], g);
    if (lp > bestLp) {
      bestLp = lp;
      best = i;
    }
  }
  const ref = model.physicalAt(positions[best]);
  const count = Math.min(maxDraws, positions.length);
  const chosen: Float64Array[] = [];
  for (let j = 0; j < count; j++) chosen.push(model.physicalAt(positions[Math.floor(((j + 0.5) * positions.length) / count)]));

  const panels: DataPanel[] = [];
  const planets = system.planets;
  const PLANET_RV = 5;

  if (system.rv && likelihood.rv) {
    const rv = system.rv;
    const N = rv.times.length;
    const t = rv.times.map((x) => x - system.epoch);
    const rvPlanets = likelihood.rvPlanets;
    // Per-planet velocities of the reference draw at the data times.
    const single = createRvCurveKernel({ times: t, planets: 1, eccentricityForm: 'root' });
    const perPlanet = rvPlanets.map((_, p) => {
      const out = new Float64Array(N);
      const v = likelihood.rvVector(ref);
      single.value(v.slice(p * PLANET_RV, (p + 1) * PLANET_RV), out);
      return out;
    });
    const baseAt = (phi: Float64Array, i: number): number => {
      let b = phi[layout.offset[rv.instrument[i]]];
      for (let d = 0; d < layout.trend.length; d++) b += phi[layout.trend[d]] * t[i] ** (d + 1);
      return b;
    };
    const fullModel = new Float64Array(N);
    for (let i = 0; i < N; i++) {
      fullModel[i] = baseAt(ref, i);
      for (const v of perPlanet) fullModel[i] += v[i];
    }
    const errorsWithJitter = (i: number): number => Math.hypot(rv.errors[i], ref[layout.jitter[rv.instrument[i]]]);
    const groupsBy = (x: (i: number) => number, y: (i: number) => number): PanelGroup[] =>
      rv.labels.map((label, j) => {
        const rows: number[] = [];
        for (let i = 0; i < N; i++) if (rv.instrument[i] === j) rows.push(i);
        return {
          label,
          x: Float64Array.from(rows, x),
          y: Float64Array.from(rows, y),
          yErr: Float64Array.from(rows, errorsWithJitter),
        };
      });

    // Against time: offsets removed, model = planets + trend.
    const tGrid = grid(Math.min(...t), Math.max(...t), Math.max(nCurve, 2));
    const all = createRvCurveKernel({ times: tGrid, planets: rvPlanets.length, eccentricityForm: 'root' });
    const curveBuffer = new Float64Array(tGrid.length);
    panels.push({
      title: 'Radial velocities',
      xLabel: `time since ${system.epoch}`,
      xUnit: 'd',
      yLabel: 'radial velocity, offsets removed',
      yUnit: 'm/s',
      groups: groupsBy((i) => t[i], (i) => rv.values[i] - ref[layout.offset[rv.instrument[i]]]),
      modelDraws: chosen.map((phi) => {
        all.value(likelihood.rvVector(phi), curveBuffer);
        const y = Float64Array.from(curveBuffer);
        for (let q = 0; q < tGrid.length; q++) for (let d = 0; d < layout.trend.length; d++) y[q] += phi[layout.trend[d]] * tGrid[q] ** (d + 1);
        return { x: Float64Array.from(tGrid), y };
      }),
      residuals: groupsBy((i) => t[i], (i) => rv.values[i] - fullModel[i]),
    });

    // Folded, per planet.
    const phaseGrid = grid(-0.5, 0.5, Math.max(nCurve, 2));
    for (const [p, i] of rvPlanets.entries()) {
      const P = ref[layout.period[i]];
      const tc = ref[layout.tc[i]];
      const phase = (row: number): number => wrapPhase((t[row] - tc) / P);
      const own = perPlanet[p];
      panels.push({
        title: `Radial velocity of planet ${planets[i].label}, folded`,
        xLabel: 'orbital phase from conjunction',
        xUnit: 'phase',
        yLabel: 'radial velocity, other signals removed',
        yUnit: 'm/s',
        groups: groupsBy(phase, (row) => rv.values[row] - fullModel[row] + own[row]),
        modelDraws: chosen.map((phi) => {
          const Pd = phi[layout.period[i]];
          const tcd = phi[layout.tc[i]];
          const times = phaseGrid.map((x) => tcd + x * Pd);
          const out = new Float64Array(phaseGrid.length);
          createRvCurveKernel({ times, planets: 1, eccentricityForm: 'root' }).value(likelihood.rvVector(phi).slice(p * PLANET_RV, (p + 1) * PLANET_RV), out);
          return { x: Float64Array.from(phaseGrid), y: out };
        }),
        residuals: groupsBy(phase, (row) => rv.values[row] - fullModel[row]),
      });
    }
  }

  if (system.lightCurves.length > 0 && plan.transiting.length > 0) {
    const PLANET_LC = 7;
    const nT = plan.transiting.length;
    let longest = 0;
    const durations = model.valuesAt(positions[best]);
    for (const i of plan.transiting) longest = Math.max(longest, durations[`totalDuration_${planets[i].label}`] ?? 0);
    const halfWindow = (options.transitWindowHours ?? 1.5 * Math.max(longest, 0.5)) / 24;
    for (const [s, lc] of system.lightCurves.entries()) {
      const l = likelihood.lightCurves[s];
      const t = lc.times.map((x) => x - system.epoch);
      const N = t.length;
      const vRef = Float64Array.from(likelihood.lightCurveVector(ref, s) ?? []);
      if (vRef.length === 0) continue;
      const f0 = vRef[l.baselineIndex];
      const s2 = vRef[l.jitterIndex] ** 2;
      const D = l.dilutionIndex >= 0 ? vRef[l.dilutionIndex] : 0;
      let exposure = 0;
      for (let i = 0; i < N; i++) exposure = Math.max(exposure, lc.exposure[i]);
      // Each planet alone, at the data times (reference draw).
      const dataKernel = createLightCurveKernel({ times: t, planets: 1, angle: 'impact', exposureTime: lc.exposure, subSamples: lc.subSamples });
      const onePlanet = (v: Float64Array, j: number): Float64Array => {
        const q = new Float64Array(PLANET_LC + 2);
        q.set(v.subarray(j * PLANET_LC, (j + 1) * PLANET_LC), 0);
        q[PLANET_LC] = v[nT * PLANET_LC];
        q[PLANET_LC + 1] = v[nT * PLANET_LC + 1];
        return q;
      };
      const deficits = plan.transiting.map((_, j) => {
        const F = dataKernel.flux(onePlanet(vRef, j), new Float64Array(N));
        for (let i = 0; i < N; i++) F[i] = 1 - F[i];
        return F;
      });
      const relative = (i: number): number => (lc.flux[i] / f0) * (1 + D) - D;
      const errorOf = (i: number): number => (Math.sqrt(lc.errors[i] ** 2 + s2) / f0) * (1 + D);
      const totalDeficit = new Float64Array(N);
      for (const d of deficits) for (let i = 0; i < N; i++) totalDeficit[i] += d[i];
      const hoursGrid = grid(-halfWindow * 24, halfWindow * 24, Math.max(nCurve, 2));
      for (const [j, i] of plan.transiting.entries()) {
        const P = ref[layout.period[i]];
        const tc = ref[layout.tc[i]];
        const rows: number[] = [];
        for (let r = 0; r < N; r++) {
          const dt = t[r] - tc - P * Math.round((t[r] - tc) / P);
          if (Math.abs(dt) <= halfWindow) rows.push(r);
        }
        if (rows.length === 0) continue;
        const hours = (r: number): number => 24 * (t[r] - tc - P * Math.round((t[r] - tc) / P));
        const own = deficits[j];
        panels.push({
          title: `Transit of planet ${planets[i].label}, light curve ${lc.label}`,
          xLabel: 'time from mid-transit',
          xUnit: 'h',
          yLabel: 'flux, other transits removed',
          yUnit: 'relative flux',
          groups: [{ label: lc.label, x: Float64Array.from(rows, hours), y: Float64Array.from(rows, (r) => relative(r) + totalDeficit[r] - own[r]), yErr: Float64Array.from(rows, errorOf) }],
          modelDraws: chosen.flatMap((phi) => {
            const v = likelihood.lightCurveVector(phi, s);
            if (!v) return [];
            const tcd = phi[layout.tc[i]];
            const times = hoursGrid.map((h) => tcd + h / 24);
            const kernel = createLightCurveKernel({ times, planets: 1, angle: 'impact', exposureTime: exposure, subSamples: exposure > 0 ? lc.subSamples : 1 });
            return [{ x: Float64Array.from(hoursGrid), y: Float64Array.from(kernel.flux(onePlanet(v, j))) }];
          }),
          residuals: [{ label: lc.label, x: Float64Array.from(rows, hours), y: Float64Array.from(rows, (r) => relative(r) - (1 - totalDeficit[r])), yErr: Float64Array.from(rows, errorOf) }],
        });
      }
    }
  }
  return panels;
}

/**
 * Assembles a built model: the plan's sampled quantities become parameters of the
 * modelling layer (`compileModel` of `@apsis/core`) with a fused float64 likelihood,
 * and the result is wrapped into a {@link PlanetSystemModel}, a `Target` whose trace
 * columns are the physical parameters and the derived quantities.
 *
 * Sampler coordinates (numerics policy of the design notes): every parameter's
 * unconstrained coordinate is centred and scaled (`supports/centred.ts`) so that u = 0
 * is the starting point and one unit of u is about one posterior standard deviation.
 * The builder (1) compiles with the starting guesses as centres and prior widths as
 * scales, (2) unless `searchMode` is false, moves the centres to the posterior mode
 * found by L-BFGS (`findMode`), (3) takes each scale from the curvature of the
 * log-density along its coordinate there, 1/√(−∂² log p/∂u²) (central differences of
 * the exact gradient), and compiles again; (4) unless `searchMode` is false, repeats
 * the search in these better-scaled coordinates and, if it moved, (3). Period and
 * conjunction time thus become a float64 reference plus an offset in units of their
 * posterior width, and
 * `runChains`' default start (uniform in (−2, 2) in every coordinate) spreads the
 * chains over about ±2 posterior standard deviations around the mode.
 */
import {
  compileModel,
  findMode,
  float64Likelihood,
  supports,
  type CompiledModel,
  type LogDensityParts,
  type ScalarPrior,
  type Support,
  type Target,
  type TargetOutputs,
  type VectorPrior,
} from '@apsis/core';
import { outputColumns, type OutputColumns } from './derivedQuantities.js';
import { FitDataError, FitSettingsError } from './errors.js';
import { planParameters, type ParameterPlan, type PlanEntry } from './parameterPlan.js';
import type { PreparedSystem } from './prepareInput.js';
import { centredSupport } from './supports/centred.js';
import { impactFractionSupport } from './supports/impactFraction.js';
import { createPhysicalMapping } from './physicalMapping.js';
import { createSystemLikelihood, type SystemLikelihood } from './systemLikelihood.js';

/** One sampled parameter as the model describes it. */
export interface ParameterSummary {
  /** Trace column(s): one name, or `sqrtEcosW_x` and `sqrtEsinW_x`. */
  readonly names: readonly string[];
  /** Unit ('' for dimensionless). */
  readonly unit: string;
  /** The prior in words, with the reason for a default. */
  readonly prior: string;
  /** The key that replaces the prior in `priors`, or null. */
  readonly priorKey: string | null;
  /** Where the sampler's coordinate is centred (physical units). */
  readonly centre: readonly number[];
}

/** A built planetary-system model: a `Target` with named physical outputs. */
export interface PlanetSystemModel extends Target {
  /** Which builder made it. */
  readonly kind: 'rv' | 'transit' | 'joint';
  readonly dim: number;
  /** Names of the sampler's (centred, scaled) coordinates, e.g. `period_b.u`. */
  readonly names: readonly string[];
  /** Trace columns: sampled parameters (physical values), then derived quantities. */
  readonly outputs: TargetOutputs;
  /** Reference epoch, days in the data's time system; `tc_*` and `periastronTime_*` count from it. */
  readonly epoch: number;
  /** Unit of every trace column. */
  readonly units: Readonly<Record<string, string>>;
  /** The sampled parameters, their priors and centres. */
  readonly parameters: readonly ParameterSummary[];
  /** Parameters held fixed, by trace name. */
  readonly fixed: Readonly<Record<string, number>>;
  /** log p(x) and its gradient (float64). */
  logDensityGrad(x: Float64Array, grad: Float64Array): number;
  /** Prior, Jacobian and likelihood parts of the log-density at x. */
  logDensityParts(x: Float64Array): LogDensityParts;
  /** Every trace column at a sampler position, by name. */
  valuesAt(x: Float64Array): Record<string, number>;
  /**
   * The sampler position of named physical values (trace names of sampled parameters;
   * the others stay at their centres). Unknown names and values outside the support
   * are errors.
   */
  positionOf(values: Readonly<Record<string, number>>): Float64Array;
  /** The physical vector Φ at x (for plots and checks), into `out` if given. */
  physicalAt(x: Float64Array, out?: Float64Array): Float64Array;
  /** Structure used by the plotting and simulation helpers. */
  readonly structure: {
    readonly system: PreparedSystem;
    readonly plan: ParameterPlan;
    readonly likelihood: SystemLikelihood;
    readonly columns: OutputColumns;
    readonly compiled: CompiledModel;
  };
}

function declaredName(e: PlanEntry): string {
  if (e.impactOf) return e.name.replace('impactParameter_', 'impactFraction_');
  if (e.cycleShifted) return e.name.replace('tc_', 'conjunctionNearData_');
  if (e.durationScaled) return e.name === 'starDensity' ? 'centralTransitDensity' : e.name.replace('scaledSemiMajorAxis_', 'centralTransitAxis_');
  return e.name;
}

/** The base support of a sampled entry: the natural bounds intersected with the prior's. */
function baseSupport(e: PlanEntry): Support {
  // An eccentricity prior ending below 1 sets the disk's radius (√e_max).
  if (e.size === 2) return supports.unitDisk(Math.sqrt(Math.min(1, e.prior.upper)));
  if (e.impactOf) return impactFractionSupport();
  const prior = e.prior as ScalarPrior;
  const lo = Math.max(e.lower, prior.lower);
  const hi = Math.min(e.upper, prior.upper);
  if (!(lo < hi)) {
    throw new FitSettingsError(`priors.${e.priorKey ?? e.name}`, prior.description, `a prior overlapping the values ${e.name} can take, [${e.lower}, ${e.upper}]`);
  }
  if (Number.isFinite(lo) && Number.isFinite(hi)) return supports.interval(lo, hi);
  if (Number.isFinite(lo)) return lo === 0 ? supports.positive() : supports.lowerBounded(lo);
  if (Number.isFinite(hi)) return supports.upperBounded(hi);
  return supports.real();
}

function clampInside(x: number, lo: number, hi: number): number {
  if (Number.isFinite(lo) && Number.isFinite(hi)) {
    const m = 1e-6 * (hi - lo);
    return Math.min(Math.max(x, lo + m), hi - m);
  }
  if (Number.isFinite(lo) && !(x > lo)) return lo + Math.max(1e-6 * Math.abs(lo), 1e-12);
  if (Number.isFinite(hi) && !(x < hi)) return hi - Math.max(1e-6 * Math.abs(hi), 1e-12);
  return x;
}

/**
 * A prior's width at x from the curvature of its log-density, 1/√(−(ln p)''), where
 * that is negative (a normal prior gives its sd); NaN elsewhere (flat priors).
 */
function priorWidth(prior: ScalarPrior, x: number): number {
  const h = 1e-4 * Math.max(1e-3, Math.abs(x));
  const c = (prior.logDensityDerivative(x + h) - prior.logDensityDerivative(x - h)) / (2 * h);
  return c < 0 && Number.isFinite(c) ? 1 / Math.sqrt(-c) : NaN;
}

/** Whether an eccentricity-vector prior's density grows without bound towards e = 0. */
function singularAtZero(prior: VectorPrior): boolean {
  const at = (e: number): number => prior.logDensity(Float64Array.of(Math.sqrt(e), 0), 0, 2);
  const near = at(1e-12);
  return !Number.isFinite(near) || near - at(1e-4) > 1;
}

interface Declared {
  readonly entry: PlanEntry;
  readonly name: string;
  readonly base: Support;
  /** Base-coordinate centre and scale, one per unconstrained coordinate. */
  centre: Float64Array;
  scale: Float64Array;
  /** Largest scale allowed (bounded bases: a few logistic or log units). */
  readonly maxScale: number;
}

/** Builds the model of a validated system (see the file notes). */
export async function buildPlanetModel(system: PreparedSystem): Promise<PlanetSystemModel> {
  const plan = planParameters(system);
  const likelihood = createSystemLikelihood(system, plan);
  const columns = outputColumns(system, plan);
  const L = plan.layout.length;

  // Φ with the fixed values in place.
  const phiFixed = new Float64Array(L);
  for (const e of plan.entries) for (let k = 0; k < e.size; k++) phiFixed[e.slot + k] = (e.fixed ?? e.guess)[k];

  // Starting values of the sampled coordinates: the inverse map of the guesses.
  const sampled = plan.entries.filter((e) => e.fixed === null);
  const thetaAt: number[] = [];
  sampled.reduce((offset, e) => (thetaAt.push(offset), offset + e.size), 0);
  const thetaGuess = new Float64Array(sampled.reduce((n, e) => n + e.size, 0));
  if (!createPhysicalMapping(sampled, thetaAt).invert(phiFixed, thetaGuess)) {
    throw new FitSettingsError('start', 'the starting guesses', 'a transit geometry and limb darkening that can be sampled (0 ≤ b < 1 + k, physical limb darkening)');
  }
  const declared: Declared[] = sampled.map((e, n) => {
    const base = baseSupport(e);
    const transform = base.bind(e.size);
    const raw = Array.from(thetaGuess.subarray(thetaAt[n], thetaAt[n] + e.size));
    // Keep the starting value strictly inside the support.
    const value = e.size === 2 ? raw : [clampInside(raw[0], base.lower, base.upper)];
    const centre = new Float64Array(transform.unconstrainedLength);
    if (!transform.inverse(value, 0, centre, 0)) {
      throw new FitSettingsError(`start.${e.columns[0]}`, value[0], `a starting value inside the support ${base.description}`);
    }
    const width = e.size === 1 && !e.impactOf ? priorWidth(e.prior as ScalarPrior, value[0]) : NaN;
    const real = base.kind === 'real';
    const s0 = e.size === 2 ? 0.3 : real && width > 0 ? width : 1;
    return {
      entry: e,
      name: declaredName(e),
      base,
      centre,
      scale: new Float64Array(centre.length).fill(s0),
      maxScale: e.size === 2 ? 0.5 : real ? Infinity : 2,
    };
  });
  const dim = declared.reduce((s, d) => s + d.centre.length, 0);
  const points = (system.rv?.times.length ?? 0) + system.lightCurves.reduce((s, l) => s + l.times.length, 0);
  if (points < dim) {
    throw new FitDataError('data', undefined, points, `at least ${dim} points in all, one per sampled parameter`);
  }

  const compile = (): Promise<CompiledModel> =>
    compileModel({
      parameters: declared.map((d) => ({
        name: d.name,
        ...(d.entry.size === 2 ? { size: 2 } : {}),
        support: centredSupport(d.base, d.centre, d.scale),
        prior: d.entry.prior,
      })),
      likelihood: float64Likelihood((layout) => {
        const mapping = createPhysicalMapping(
          declared.map((d) => d.entry),
          declared.map((d) => layout.offset(d.name)),
        );
        const phi = Float64Array.from(phiFixed);
        const gPhi = new Float64Array(L);
        return (theta, grad) => {
          if (!mapping.fill(theta, phi)) return -Infinity;
          const value = likelihood.evaluate(phi, gPhi) + mapping.correction(theta, phi, gPhi);
          if (!Number.isFinite(value)) return -Infinity;
          mapping.pullBack(theta, phi, gPhi, grad);
          return value;
        };
      }),
    });

  let compiled = await compile();
  const moveCentres = (u: Float64Array): void => {
    let c = 0;
    for (const d of declared) for (let k = 0; k < d.centre.length; k++, c++) d.centre[k] += d.scale[k] * u[c];
  };

  const startCentres = declared.map((d) => Float64Array.from(d.centre));
  // Moves the centres to the mode found from u = 0; false if the search found no better point.
  const searchAndMove = (): boolean => {
    const grad = new Float64Array(dim);
    const start = compiled.logDensityGrad(new Float64Array(dim), grad);
    if (!Number.isFinite(start)) return false;
    const mode = findMode(compiled, { init: new Float64Array(dim), maxIterations: 400 });
    if (!(Number.isFinite(mode.logDensity) && mode.logDensity > start)) return false;
    moveCentres(mode.position);
    // An eccentricity prior with an infinite density at e = 0 (a beta with α < 1)
    // puts the mode on that point; such vectors keep their starting centre.
    declared.forEach((d, n) => {
      if (d.entry.size === 2 && Math.hypot(d.centre[0], d.centre[1]) < 1e-3 && singularAtZero(d.entry.prior as VectorPrior)) {
        d.centre.set(startCentres[n]);
      }
    });
    return true;
  };
  if (system.searchMode && searchAndMove()) compiled = await compile();
  rescaleByCurvature(compiled, declared, dim);
  compiled = await compile();
  // The first search runs in the prior widths' units, often hundreds of times the
  // posterior's, where L-BFGS crawls: on the demo's model it stopped at its 400-iteration
  // limit 18 log units below the mode. In the curvature's units a second search reaches
  // the mode in about 120 iterations; the scales are then taken again there.
  if (system.searchMode && searchAndMove()) {
    compiled = await compile();
    rescaleByCurvature(compiled, declared, dim);
    compiled = await compile();
  }

  const x0 = new Float64Array(dim);
  const g0 = new Float64Array(dim);
  const lp0 = compiled.logDensityGrad(x0, g0);
  if (!Number.isFinite(lp0)) {
    throw new FitSettingsError('start', lp0, 'a starting point with finite log-density: check the guesses (period, tc) and the data');
  }

  const layoutAt = declared.map((d) => compiled.layout.offset(d.name));
  const outputMapping = createPhysicalMapping(
    declared.map((d) => d.entry),
    layoutAt,
  );
  const thetaBuffer = new Float64Array(compiled.layout.length);
  const phiBuffer = Float64Array.from(phiFixed);
  const physicalAt = (x: Float64Array, out?: Float64Array): Float64Array => {
    compiled.outputs.write(x, thetaBuffer);
    const phi = out ?? Float64Array.from(phiFixed);
    if (out) out.set(phiFixed);
    if (!outputMapping.fill(thetaBuffer, phi)) phi.fill(NaN);
    return phi;
  };
  const outputs: TargetOutputs = {
    names: columns.names,
    write(x, out) {
      physicalAt(x, phiBuffer);
      columns.write(phiBuffer, out);
    },
  };

  const fixed: Record<string, number> = {};
  for (const e of plan.entries) if (e.fixed !== null) e.columns.forEach((c, k) => (fixed[c] = (e.fixed as number[])[k]));
  const centrePhi = physicalAt(x0);
  columns.anchor(centrePhi);
  const parameters: ParameterSummary[] = declared.map((d) => ({
    names: d.entry.columns,
    unit: d.entry.unit,
    prior: d.entry.note,
    priorKey: d.entry.priorKey,
    centre: Array.from({ length: d.entry.size }, (_, k) => centrePhi[d.entry.slot + k]),
  }));

  const model: PlanetSystemModel = {
    kind: system.kind,
    dim,
    names: compiled.names,
    outputs,
    epoch: system.epoch,
    units: columns.units,
    parameters,
    fixed,
    logDensityGrad: compiled.logDensityGrad,
    logDensityParts: (x) => compiled.logDensityParts(x),
    valuesAt(x) {
      const out = new Float64Array(columns.names.length);
      outputs.write(x, out);
      return Object.fromEntries(columns.names.map((n, i) => [n, out[i]]));
    },
    positionOf(values) {
      // The physical vector at the centre, with the given values put in, mapped back.
      const phi = physicalAt(x0);
      const byColumn = new Map<string, [number, number]>();
      declared.forEach((d, n) => d.entry.columns.forEach((c, k) => byColumn.set(c, [n, k])));
      for (const [key, v] of Object.entries(values)) {
        const hit = byColumn.get(key);
        if (!hit) throw new FitSettingsError(`values.${key}`, v, `a sampled parameter: ${[...byColumn.keys()].join(', ')}`);
        if (typeof v !== 'number' || !Number.isFinite(v)) throw new FitSettingsError(`values.${key}`, v, 'a finite number');
        phi[declared[hit[0]].entry.slot + hit[1]] = v;
      }
      const theta = new Float64Array(compiled.layout.length);
      if (!outputMapping.invert(phi, theta)) {
        throw new FitSettingsError('values', JSON.stringify(values), 'a transit geometry and limb darkening that can be sampled (0 ≤ b < 1 + k, physical limb darkening)');
      }
      const named: Record<string, number | number[]> = {};
      for (const [n, d] of declared.entries()) {
        named[d.name] = d.entry.size === 2 ? [theta[layoutAt[n]], theta[layoutAt[n] + 1]] : theta[layoutAt[n]];
      }
      try {
        return compiled.unconstrain(named);
      } catch (e) {
        const err = e as { field?: string; value?: unknown; expected?: string; message: string };
        if (typeof err.field !== 'string') throw e;
        // Name the physical parameter, not the sampled coordinate behind it.
        const declaredKey = err.field.replace(/^values\./, '');
        const d = declared.find((x) => x.name === declaredKey);
        const field = d ? `values.${d.entry.columns.join(', ')}` : err.field;
        const how = d?.entry.impactOf ? ' (sampled as b/(1 + k))' : d?.entry.cycleShifted ? ` (sampled as the conjunction ${d.entry.cycleShifted.cycles} periods later)` : d?.entry.durationScaled ? ' (sampled divided by the duration factor s)' : '';
        throw new FitSettingsError(field, err.value, `${err.expected ?? err.message}${how}`);
      }
    },
    physicalAt,
    structure: { system, plan, likelihood, columns, compiled },
  };
  return model;
}

/**
 * Sets each coordinate's scale from the curvature of log p along it at u = 0:
 * s ← s / √(−∂²/∂u²), by central differences of the exact gradient with a step that is
 * refined once to a third of the implied width. Coordinates with a non-negative or
 * non-finite curvature keep their scale.
 */
function rescaleByCurvature(target: CompiledModel, declared: Declared[], dim: number): void {
  const x = new Float64Array(dim);
  const g = new Float64Array(dim);
  const curvature = (c: number, h: number): number => {
    x[c] = h;
    const up = target.logDensityGrad(x, g);
    const gUp = g[c];
    x[c] = -h;
    const down = target.logDensityGrad(x, g);
    const gDown = g[c];
    x[c] = 0;
    if (!Number.isFinite(up) || !Number.isFinite(down)) return NaN;
    return (gUp - gDown) / (2 * h);
  };
  let c = 0;
  for (const d of declared) {
    for (let k = 0; k < d.centre.length; k++, c++) {
      let H = curvature(c, 1e-3);
      if (H < 0) {
        const h = Math.min(0.3 / Math.sqrt(-H), 1);
        const refined = curvature(c, h);
        if (refined < 0) H = refined;
      }
      if (!(H < 0) || !Number.isFinite(H)) continue;
      const s = d.scale[k] / Math.sqrt(-H);
      // Real-line and one-sided (log) coordinates may be very narrow: periods, times,
      // offsets, and a light curve's baseline flux, known to 1e-5 of itself (a floor of
      // 1e-4 log units made the demo's baseline coordinate 7 times too wide, so the
      // step size of early warmup was set by it). Two-sided ones are kept at or above
      // 1e-4 (1e-2 for eccentricity vectors), so that a singular prior at a boundary or
      // at e = 0 cannot shrink them to nothing. On a log coordinate no integrable prior
      // is singular: the density in u is p(θ)·|θ − bound|, which vanishes at the bound
      // for p ∝ |θ − bound|^(a−1), a > 0.
      const narrow = d.base.kind === 'real' || d.base.kind === 'positive' || d.base.kind === 'lowerBounded' || d.base.kind === 'upperBounded';
      const floor = narrow ? 1e-14 * Math.max(1, Math.abs(d.centre[k])) : d.entry.size === 2 ? 1e-2 : 1e-4;
      d.scale[k] = Math.min(Math.max(s, floor), d.maxScale);
    }
  }
}

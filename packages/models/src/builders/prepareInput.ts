/**
 * Validation of the builders' input (zod for the shape, then row by row for the
 * columns) and its conversion to float64 arrays with instrument indices. Every error
 * names the field and, for data, the row: `rv.errors[17] = 0: expected a finite
 * positive number (m/s)`, `lightCurves[1].flux[3] = NaN: expected a finite number`,
 * `rv.instrument[5] = "north": expected one of the instruments east, west`.
 */
import { z } from 'zod';
import { FitDataError, FitSettingsError, formatPath } from './errors.js';
import type { GeometryOption, LimbDarkeningOption, NumberColumn } from './inputs.js';

/** Labels become parts of parameter names. */
export const LABEL_PATTERN = /^[A-Za-z0-9_]+$/;
const LABEL_EXPECTED = 'a label of letters, digits and underscores';

/** Radial velocities after validation; times as given (not yet relative to the epoch). */
export interface PreparedRv {
  readonly times: Float64Array;
  readonly values: Float64Array;
  readonly errors: Float64Array;
  /** Instrument index of each point. */
  readonly instrument: Int32Array;
  /** Instrument labels by index. */
  readonly labels: readonly string[];
}

/** One light curve after validation. */
export interface PreparedLightCurve {
  readonly label: string;
  readonly times: Float64Array;
  readonly flux: Float64Array;
  readonly errors: Float64Array;
  /** Exposure time of each point, days. */
  readonly exposure: Float64Array;
  readonly subSamples: number;
  readonly band: string;
  readonly dilution: boolean;
}

/** One planet after validation, with the builder's defaults filled in. */
export interface PreparedPlanet {
  readonly label: string;
  readonly period: number;
  readonly periodUncertainty: number | undefined;
  readonly tc: number | undefined;
  readonly tcUncertainty: number | undefined;
  readonly eccentric: boolean;
  readonly semiAmplitude: number | undefined;
  readonly radiusRatio: number | undefined;
  readonly impactParameter: number | undefined;
  readonly scaledSemiMajorAxis: number | undefined;
  /** Seen in the light curves. */
  readonly transiting: boolean;
  /** Seen in the radial velocities. */
  readonly inRv: boolean;
}

export interface PreparedStar {
  readonly mass: number | undefined;
  readonly massUncertainty: number;
  readonly radius: number | undefined;
  readonly radiusUncertainty: number;
  readonly density: number | undefined;
  readonly densityUncertainty: number;
}

/** Which builder is asking. */
export type BuilderKind = 'rv' | 'transit' | 'joint';

/** Everything the builders need, validated. */
export interface PreparedSystem {
  readonly kind: BuilderKind;
  readonly rv: PreparedRv | undefined;
  readonly lightCurves: readonly PreparedLightCurve[];
  readonly planets: readonly PreparedPlanet[];
  readonly star: PreparedStar;
  readonly epoch: number;
  readonly trendDegree: 0 | 1 | 2;
  readonly geometry: GeometryOption;
  readonly limbDarkening: LimbDarkeningOption;
  readonly priors: Readonly<Record<string, unknown>>;
  readonly fixed: Readonly<Record<string, number>>;
  readonly start: Readonly<Record<string, number>>;
  readonly searchMode: boolean;
}

const column = z.custom<NumberColumn>(
  (v) => Array.isArray(v) || v instanceof Float64Array || v instanceof Float32Array,
  'an array of numbers',
);
const label = z.string().regex(LABEL_PATTERN, LABEL_EXPECTED);
const positive = z.number().positive();

const rvSchema = z.strictObject({
  times: column,
  values: column,
  errors: column,
  instrument: z.union([z.string(), z.array(z.string())]),
  instruments: z.array(label).min(1).optional(),
});

const lightCurveSchema = z.strictObject({
  label,
  times: column,
  flux: column,
  errors: column,
  exposureTime: z.union([z.number().nonnegative(), column]).optional(),
  subSamples: z.number().int().min(1).max(1000).optional(),
  band: label.optional(),
  dilution: z.boolean().optional(),
});

const planetSchema = z.strictObject({
  label,
  period: positive,
  periodUncertainty: positive.optional(),
  tc: z.number().optional(),
  tcUncertainty: positive.optional(),
  eccentric: z.boolean().optional(),
  semiAmplitude: positive.optional(),
  radiusRatio: positive.optional(),
  impactParameter: z.number().nonnegative().optional(),
  scaledSemiMajorAxis: z.number().gt(1).optional(),
  transiting: z.boolean().optional(),
});

const starSchema = z.strictObject({
  mass: positive.optional(),
  massUncertainty: z.number().nonnegative().optional(),
  radius: positive.optional(),
  radiusUncertainty: z.number().nonnegative().optional(),
  density: positive.optional(),
  densityUncertainty: z.number().nonnegative().optional(),
});

const shared = {
  planets: z.array(planetSchema).min(1),
  star: starSchema.optional(),
  referenceEpoch: z.number().optional(),
  priors: z.record(z.string(), z.unknown()).optional(),
  fixed: z.record(z.string(), z.number()).optional(),
  start: z.record(z.string(), z.number()).optional(),
  searchMode: z.boolean().optional(),
};
const rvParts = { rv: rvSchema, trend: z.enum(['none', 'linear', 'quadratic']).optional() };
const lcParts = {
  lightCurves: z.array(lightCurveSchema).min(1),
  geometry: z.enum(['density', 'scaledAxis']).optional(),
  limbDarkening: z.enum(['kipping', 'quadratic']).optional(),
};

const schemas = {
  rv: z.strictObject({ ...shared, ...rvParts }),
  transit: z.strictObject({ ...shared, ...lcParts }),
  joint: z.strictObject({ ...shared, ...rvParts, ...lcParts }),
};

const EXPECTED: Record<string, string> = {
  times: 'an array of finite numbers (days)',
  values: 'an array of finite numbers (m/s)',
  errors: 'an array of finite positive numbers',
  flux: 'an array of finite numbers',
  instrument: 'an instrument label, or one label per point',
  instruments: `an array of labels (${LABEL_EXPECTED})`,
  label: LABEL_EXPECTED,
  band: LABEL_EXPECTED,
  period: 'a finite positive number (days)',
  periodUncertainty: 'a finite positive number (days)',
  tc: 'a finite number (days, in the data\'s time system)',
  tcUncertainty: 'a finite positive number (days)',
  semiAmplitude: 'a finite positive number (m/s)',
  radiusRatio: 'a finite positive number',
  impactParameter: 'a finite number >= 0 (stellar radii)',
  scaledSemiMajorAxis: 'a finite number > 1',
  exposureTime: 'a finite number >= 0 (days), or one per point',
  subSamples: 'an integer from 1 to 1000',
  mass: 'a finite positive number (solar masses)',
  radius: 'a finite positive number (solar radii)',
  density: 'a finite positive number (g/cm^3)',
  massUncertainty: 'a finite number >= 0 (solar masses)',
  radiusUncertainty: 'a finite number >= 0 (solar radii)',
  densityUncertainty: 'a finite number >= 0 (g/cm^3)',
  referenceEpoch: 'a finite number (days)',
  trend: "'none', 'linear' or 'quadratic'",
  geometry: "'density' or 'scaledAxis'",
  limbDarkening: "'kipping' or 'quadratic'",
  fixed: 'an object of finite numbers by parameter name',
  start: 'an object of finite numbers by parameter name',
  searchMode: 'true or false',
  eccentric: 'true or false',
  transiting: 'true or false',
  dilution: 'true or false',
  planets: 'a non-empty array of planets { label, period, tc?, ... }',
  lightCurves: 'a non-empty array of light curves { label, times, flux, errors, ... }',
  rv: 'radial velocities { times, values, errors, instrument }',
};

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = root;
  for (const p of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[p];
  }
  return v;
}

function parseShape(kind: BuilderKind, input: unknown): void {
  const entry = kind === 'rv' ? 'createRvModel' : kind === 'transit' ? 'createTransitModel' : 'createJointModel';
  if (input === null || typeof input !== 'object' || Array.isArray(input)) {
    throw new FitSettingsError(entry, input, 'an object describing the data, planets and options');
  }
  const r = schemas[kind].safeParse(input);
  if (r.success) return;
  const issue = r.error.issues[0];
  if (issue.code === 'unrecognized_keys') {
    const where = formatPath(issue.path);
    const key = issue.keys[0];
    const field = where === '' ? key : `${where}.${key}`;
    const allowed = Object.keys(where === '' ? schemas[kind].shape : {}).join(', ');
    throw new FitSettingsError(field, valueAt(input, [...issue.path, key]), allowed ? `no such field; known fields: ${allowed}` : 'no such field');
  }
  const path = issue.path as PropertyKey[];
  const last = [...path].reverse().find((p) => typeof p === 'string') as string | undefined;
  const expected = (last !== undefined ? EXPECTED[last] : undefined) ?? issue.message;
  throw new FitSettingsError(formatPath(path), valueAt(input, path), expected);
}

function toColumn(v: NumberColumn, field: string, check: (x: number) => boolean, expected: string): Float64Array {
  const n = v.length;
  const out = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    const x = v[i] as unknown;
    if (typeof x !== 'number' || !check(x)) throw new FitDataError(field, i, x, expected);
    out[i] = x;
  }
  return out;
}

const isFinite = (x: number) => Number.isFinite(x);
const isPositive = (x: number) => x > 0 && x < Infinity;

function sameLength(field: string, a: ArrayLike<number> | readonly string[], n: number, first: string): void {
  if (a.length !== n) throw new FitDataError(`${field}.length`, undefined, a.length, `${n}, the length of ${first}`);
}

interface RawRv {
  times: NumberColumn;
  values: NumberColumn;
  errors: NumberColumn;
  instrument: readonly string[] | string;
  instruments?: readonly string[];
}

function prepareRv(rv: RawRv): PreparedRv {
  const n = rv.times.length;
  if (n === 0) throw new FitDataError('rv.times', undefined, rv.times, 'at least one point');
  sameLength('rv.values', rv.values, n, 'rv.times');
  sameLength('rv.errors', rv.errors, n, 'rv.times');
  const times = toColumn(rv.times, 'rv.times', isFinite, 'a finite number (days)');
  const values = toColumn(rv.values, 'rv.values', isFinite, 'a finite number (m/s)');
  const errors = toColumn(rv.errors, 'rv.errors', isPositive, 'a finite positive number (m/s)');
  const perPoint = typeof rv.instrument === 'string' ? null : rv.instrument;
  if (perPoint) sameLength('rv.instrument', perPoint, n, 'rv.times');
  const labelAt = (i: number): string => (perPoint ? perPoint[i] : (rv.instrument as string));
  let labels: string[];
  if (rv.instruments) {
    labels = [...rv.instruments];
    const seen = new Set<string>();
    for (const [j, l] of labels.entries()) {
      if (seen.has(l)) throw new FitSettingsError(`rv.instruments[${j}]`, l, 'a label not listed before');
      seen.add(l);
    }
  } else {
    labels = [];
    for (let i = 0; i < n; i++) {
      const l = labelAt(i);
      if (!LABEL_PATTERN.test(l)) throw new FitDataError('rv.instrument', perPoint ? i : undefined, l, LABEL_EXPECTED);
      if (!labels.includes(l)) labels.push(l);
    }
  }
  const index = new Map(labels.map((l, j) => [l, j]));
  const instrument = new Int32Array(n);
  const counts = new Int32Array(labels.length);
  for (let i = 0; i < n; i++) {
    const j = index.get(labelAt(i));
    if (j === undefined) {
      throw new FitDataError('rv.instrument', perPoint ? i : undefined, labelAt(i), `one of the instruments ${labels.join(', ')}`);
    }
    instrument[i] = j;
    counts[j]++;
  }
  for (let j = 0; j < labels.length; j++) {
    if (counts[j] === 0) throw new FitDataError('rv.instruments', j, labels[j], 'an instrument with at least one point');
  }
  return { times, values, errors, instrument, labels };
}

/** Default sub-samples: each spans at most 2 minutes (see docs/fitting-transits.md). */
export function defaultSubSamples(exposure: Float64Array): number {
  let longest = 0;
  for (let i = 0; i < exposure.length; i++) longest = Math.max(longest, exposure[i]);
  return Math.max(1, Math.ceil(longest / (2 / 1440) - 1e-9));
}

interface RawLightCurve {
  label: string;
  times: NumberColumn;
  flux: NumberColumn;
  errors: NumberColumn;
  exposureTime?: number | NumberColumn;
  subSamples?: number;
  band?: string;
  dilution?: boolean;
}

function prepareLightCurve(lc: RawLightCurve, s: number): PreparedLightCurve {
  const at = `lightCurves[${s}]`;
  const n = lc.times.length;
  if (n === 0) throw new FitDataError(`${at}.times`, undefined, lc.times, 'at least one point');
  sameLength(`${at}.flux`, lc.flux, n, `${at}.times`);
  sameLength(`${at}.errors`, lc.errors, n, `${at}.times`);
  const times = toColumn(lc.times, `${at}.times`, isFinite, 'a finite number (days)');
  const flux = toColumn(lc.flux, `${at}.flux`, isFinite, 'a finite number');
  const errors = toColumn(lc.errors, `${at}.errors`, isPositive, 'a finite positive number');
  let exposure: Float64Array;
  const e = lc.exposureTime ?? 0;
  if (typeof e === 'number') exposure = new Float64Array(n).fill(e);
  else {
    sameLength(`${at}.exposureTime`, e, n, `${at}.times`);
    exposure = toColumn(e, `${at}.exposureTime`, isPositive, 'a finite positive number (days)');
  }
  return {
    label: lc.label,
    times,
    flux,
    errors,
    exposure,
    subSamples: lc.subSamples ?? defaultSubSamples(exposure),
    band: lc.band ?? lc.label,
    dilution: lc.dilution ?? false,
  };
}

function middleOf(columns: readonly Float64Array[]): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of columns) {
    for (let i = 0; i < c.length; i++) {
      if (c[i] < lo) lo = c[i];
      if (c[i] > hi) hi = c[i];
    }
  }
  return Math.round(0.5 * (lo + hi));
}

/** Validates a builder's input and converts it; throws FitDataError / FitSettingsError. */
export function prepareInput(kind: BuilderKind, input: unknown): PreparedSystem {
  parseShape(kind, input);
  const raw = input as Record<string, unknown>;
  const rv = kind === 'transit' ? undefined : prepareRv(raw.rv as RawRv);
  const lightCurves = kind === 'rv' ? [] : (raw.lightCurves as RawLightCurve[]).map(prepareLightCurve);
  const seenSets = new Set<string>();
  for (const [s, lc] of lightCurves.entries()) {
    if (seenSets.has(lc.label)) throw new FitSettingsError(`lightCurves[${s}].label`, lc.label, 'a label not used by another light curve');
    seenSets.add(lc.label);
  }
  const rawPlanets = raw.planets as Record<string, unknown>[];
  const seenPlanets = new Set<string>();
  const planets: PreparedPlanet[] = rawPlanets.map((p, i) => {
    const lbl = p.label as string;
    if (seenPlanets.has(lbl)) throw new FitSettingsError(`planets[${i}].label`, lbl, 'a label not used by another planet');
    seenPlanets.add(lbl);
    if (kind !== 'joint' && p.transiting !== undefined) {
      throw new FitSettingsError(`planets[${i}].transiting`, p.transiting, 'no such field outside joint fits (every planet is seen in the one kind of data)');
    }
    const transiting = kind === 'transit' || (kind === 'joint' && p.transiting !== false);
    if (transiting && p.tc === undefined) {
      throw new FitSettingsError(`planets[${i}].tc`, undefined, 'a mid-transit time (days, in the data\'s time system) for a transiting planet');
    }
    return {
      label: lbl,
      period: p.period as number,
      periodUncertainty: p.periodUncertainty as number | undefined,
      tc: p.tc as number | undefined,
      tcUncertainty: p.tcUncertainty as number | undefined,
      eccentric: (p.eccentric as boolean | undefined) ?? kind !== 'transit',
      semiAmplitude: p.semiAmplitude as number | undefined,
      radiusRatio: p.radiusRatio as number | undefined,
      impactParameter: p.impactParameter as number | undefined,
      scaledSemiMajorAxis: p.scaledSemiMajorAxis as number | undefined,
      transiting,
      inRv: kind !== 'transit',
    };
  });
  const st = (raw.star ?? {}) as Record<string, number | undefined>;
  const star: PreparedStar = {
    mass: st.mass,
    massUncertainty: st.massUncertainty ?? 0,
    radius: st.radius,
    radiusUncertainty: st.radiusUncertainty ?? 0,
    density: st.density,
    densityUncertainty: st.densityUncertainty ?? 0,
  };
  for (const [field, value, base] of [
    ['star.massUncertainty', st.massUncertainty, st.mass],
    ['star.radiusUncertainty', st.radiusUncertainty, st.radius],
    ['star.densityUncertainty', st.densityUncertainty, st.density],
  ] as const) {
    if (value !== undefined && value > 0 && base === undefined) {
      throw new FitSettingsError(field, value, `a value only together with ${field.replace('Uncertainty', '')}`);
    }
  }
  const allTimes = [...(rv ? [rv.times] : []), ...lightCurves.map((l) => l.times)];
  const trend = (raw.trend as string | undefined) ?? 'none';
  return {
    kind,
    rv,
    lightCurves,
    planets,
    star,
    epoch: (raw.referenceEpoch as number | undefined) ?? middleOf(allTimes),
    trendDegree: trend === 'linear' ? 1 : trend === 'quadratic' ? 2 : 0,
    geometry: (raw.geometry as GeometryOption | undefined) ?? 'density',
    limbDarkening: (raw.limbDarkening as LimbDarkeningOption | undefined) ?? 'kipping',
    priors: (raw.priors as Record<string, unknown> | undefined) ?? {},
    fixed: (raw.fixed as Record<string, number> | undefined) ?? {},
    start: (raw.start as Record<string, number> | undefined) ?? {},
    searchMode: (raw.searchMode as boolean | undefined) ?? true,
  };
}

/**
 * The plan of a model: every physical quantity with its slot in Φ, unit, natural bounds,
 * prior (default or given) and the reason for the default, starting guess, and whether
 * it is sampled or held fixed. Defaults are derived from the data as documented in
 * docs/fitting-radial-velocities.md and docs/fitting-transits.md; each carries its
 * reason in `note`.
 */
import { priors, type Prior, type ScalarPrior } from '@apsis/core';
import { eccentricityDiskPrior } from './eccentricityPrior.js';
import { FitSettingsError } from './errors.js';
import type { PhysicalLayout } from './physicalLayout.js';
import { resolveScalarPrior } from './priorInput.js';
import type { PreparedSystem } from './prepareInput.js';
import { centralDuration, estimateDepth, fitSinusoids, inverseVarianceMean, scaledAxisFromDensity, transitTimingCentre } from './startingEstimates.js';

/** Density of the Sun, g/cm³ (nominal mass and radius, IAU 2015 B3, with G of CODATA 2018). */
export const SOLAR_DENSITY_CGS = 1.40978;

/** One physical quantity (or the two of an eccentricity vector). */
export interface PlanEntry {
  /** Name in the compiled model (and the trace, apart from the notes below). */
  readonly name: string;
  /** Trace column names: the name, or `sqrtEcosW_x`, `sqrtEsinW_x` for an eccentricity vector. */
  readonly columns: readonly string[];
  readonly slot: number;
  readonly size: 1 | 2;
  readonly unit: string;
  /**
   * Natural bounds of the value: the closed range a fixed value may take (both elements
   * of a vector lie in the unit disk).
   */
  readonly lower: number;
  readonly upper: number;
  /** The lower bound itself is excluded (K, k, densities, masses, radii, the baseline). */
  readonly strictLower?: boolean;
  readonly prior: Prior;
  /** The prior in words, with the reason for a default. */
  readonly note: string;
  /** Starting guess, physical units. */
  readonly guess: number[];
  /** Fixed value(s), or null when sampled. */
  readonly fixed: number[] | null;
  /**
   * Only for impact parameters: the sampled coordinate is a signed β = b/(1 + k),
   * uniform on (−1, 1), and Φ holds the signed b = β (1 + k) (negative for i > 90°,
   * which the light curve cannot tell from i < 90°). b = 0 is then an interior point;
   * β on (0, 1) was tried and, on the demo's model with its dense metric, gave 0.65
   * times the ESS per gradient (4 chains × 1000 draws, two seeds: 1.1e-2 against
   * 1.7e-2), the smallest ESS being that of b, whose posterior reaches b = 0 and there
   * became a long tail of the logit. The sampler's coordinate for β is a stretched
   * logistic one (`supports/impactFraction.ts`). `radiusSlot` is the slot of k.
   */
  readonly impactOf?: { readonly radiusSlot: number };
  /**
   * Only for conjunction times: the sampled coordinate is T = tc + cycles · P, the
   * conjunction nearest the middle of the data that time it (in-transit points for a
   * transiting planet, radial velocities otherwise), where T and P are nearly
   * uncorrelated; tc, the conjunction nearest the epoch, may lie many periods away and
   * then has a correlation with P close to −1, which a diagonal metric cannot follow.
   * Φ holds tc = T − cycles · P (Jacobian 1). `prior` is the prior of T; `correction`,
   * when set, is an unbounded prior given for tc itself, and the model adds
   * ln p(tc) − ln p(T) so that it holds exactly.
   */
  readonly cycleShifted?: { readonly cycles: number; readonly periodSlot: number; readonly correction: ScalarPrior | null };
  /** The key that replaces the prior in `priors` (null: not replaceable). */
  readonly priorKey: string | null;
  /**
   * Only for the stellar density (power 3) and a/R_* (power 1): the sampled coordinate is
   * x₀ = x/s^power, the value a central transit on a circular orbit of the same duration
   * would imply (`durationScale.ts`), with s taken from the planet whose slots are
   * given. `prior` is then the prior of x₀; `correction`, when set, is the prior given for
   * x itself, and the model adds ln p(x) − ln p(x₀) + power · ln s so that it holds
   * exactly. Φ holds x.
   */
  readonly durationScaled?: {
    readonly power: 1 | 3;
    readonly impactSlot: number;
    readonly radiusSlot: number;
    readonly eccentricitySlot: number;
    readonly correction: ScalarPrior | null;
  };
}

/** The plan: layout and entries. */
export interface ParameterPlan {
  readonly layout: PhysicalLayout;
  readonly entries: readonly PlanEntry[];
  /** Band labels in order. */
  readonly bands: readonly string[];
  /** Band index of each light curve. */
  readonly bandOf: Int32Array;
  /** Transiting planets' indices, in order. */
  readonly transiting: readonly number[];
  /** Expected central transit duration per planet (days; NaN for non-transiting), from the starting geometry. */
  readonly durationGuess: Float64Array;
}

function spanOf(columns: readonly Float64Array[]): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (const c of columns) for (let i = 0; i < c.length; i++) {
    lo = Math.min(lo, c[i]);
    hi = Math.max(hi, c[i]);
  }
  return hi - lo;
}

function median(values: ArrayLike<number>): number {
  const s = Float64Array.from(values).sort();
  const n = s.length;
  return n % 2 ? s[(n - 1) / 2] : 0.5 * (s[n / 2 - 1] + s[n / 2]);
}

function sd(values: ArrayLike<number>): number {
  const n = values.length;
  if (n < 2) return 0;
  let m = 0;
  for (let i = 0; i < n; i++) m += values[i];
  m /= n;
  let v = 0;
  for (let i = 0; i < n; i++) v += (values[i] - m) ** 2;
  return Math.sqrt(v / (n - 1));
}

function rms(values: ArrayLike<number>): number {
  let s = 0;
  for (let i = 0; i < values.length; i++) s += values[i] * values[i];
  return Math.sqrt(s / values.length);
}

const fmt = (x: number): string => Number(x.toPrecision(4)).toString();

/** Builds the plan for a validated system (see the file notes). */
export function planParameters(system: PreparedSystem): ParameterPlan {
  const { planets, rv, lightCurves, star, epoch } = system;
  const nP = planets.length;
  const entries: PlanEntry[] = [];
  let length = 0;
  const slot = (n = 1): number => {
    const s = length;
    length += n;
    return s;
  };
  const add = (e: Omit<PlanEntry, 'columns' | 'fixed' | 'priorKey'> & Partial<Pick<PlanEntry, 'columns' | 'fixed' | 'priorKey'>>): void => {
    entries.push({ columns: [e.name], fixed: null, priorKey: e.name, ...e });
  };

  // Data summaries.
  const rvSpan = rv ? spanOf([rv.times]) : 0;
  const lcSpan = spanOf(lightCurves.map((l) => l.times));
  const sinusoids = rv ? fitSinusoids(rv, epoch, planets.map((p) => p.period), system.trendDegree) : null;
  const densityGuess =
    star.density ?? (star.mass !== undefined && star.radius !== undefined ? (SOLAR_DENSITY_CGS * star.mass) / star.radius ** 3 : SOLAR_DENSITY_CGS);
  const transiting = planets.flatMap((p, i) => (p.transiting ? [i] : []));
  const durationGuess = new Float64Array(nP).fill(NaN);

  const layout = {
    period: new Int32Array(nP).fill(-1),
    tc: new Int32Array(nP).fill(-1),
    eccentricity: new Int32Array(nP).fill(-1),
    semiAmplitude: new Int32Array(nP).fill(-1),
    radiusRatio: new Int32Array(nP).fill(-1),
    impact: new Int32Array(nP).fill(-1),
    scaledAxis: new Int32Array(nP).fill(-1),
    density: -1,
    starMass: -1,
    starRadius: -1,
    offset: new Int32Array(rv ? rv.labels.length : 0),
    jitter: new Int32Array(rv ? rv.labels.length : 0),
    trend: new Int32Array(system.trendDegree),
    limbFirst: new Int32Array(0),
    limbSecond: new Int32Array(0),
    baseline: new Int32Array(lightCurves.length),
    fluxJitter: new Int32Array(lightCurves.length),
    dilution: new Int32Array(lightCurves.length).fill(-1),
    length: 0,
  };

  // Planets.
  for (const [i, p] of planets.entries()) {
    const L = p.label;
    const aGuess = p.scaledSemiMajorAxis ?? scaledAxisFromDensity(densityGuess, p.period);
    const T = centralDuration(p.period, aGuess);
    if (p.transiting) durationGuess[i] = T;

    // Period: normal about the guess.
    let sigmaP: number;
    let periodNote: string;
    if (p.periodUncertainty !== undefined) {
      sigmaP = p.periodUncertainty;
      periodNote = 'the given period uncertainty';
    } else if (p.transiting) {
      sigmaP = Math.min((T * p.period) / Math.max(lcSpan, p.period), p.period / 100);
      periodNote = 'sd = expected duration × P / light-curve span (a shift of one duration across the data), at most P/100';
    } else {
      sigmaP = Math.min((p.period * p.period) / (2 * Math.max(rvSpan, p.period)), p.period / 10);
      periodNote = 'sd = P²/(2 × span), about half the width of a periodogram peak, at most P/10';
    }
    layout.period[i] = slot();
    add({
      name: `period_${L}`,
      slot: layout.period[i],
      size: 1,
      unit: 'd',
      lower: -Infinity,
      upper: Infinity,
      prior: priors.normal(p.period, sigmaP),
      note: `normal(${fmt(p.period)}, ${fmt(sigmaP)}): ${periodNote}`,
      guess: [p.period],
    });

    // Conjunction time: tc, the conjunction nearest the epoch, is what Φ and the trace
    // hold; the sampled coordinate is the conjunction nearest the data that time it.
    let tcRel: number;
    let sigmaTc: number;
    let tcNote: string;
    if (p.tc !== undefined) {
      const n = Math.round((epoch - p.tc) / p.period);
      tcRel = p.tc + n * p.period - epoch;
    } else {
      tcRel = sinusoids ? sinusoids.conjunctions[i] : 0;
    }
    const centre = p.transiting ? transitTimingCentre(lightCurves, epoch, p.period, tcRel, T) : rv ? inverseVarianceMean(rv.times, rv.errors) - epoch : NaN;
    const cycles = Number.isFinite(centre) ? Math.round((centre - tcRel) / p.period) : 0;
    const sampledRel = tcRel + cycles * p.period;
    if (p.tc !== undefined) {
      const m = Math.round((epoch + sampledRel - p.tc) / p.period);
      const s0 = p.tcUncertainty ?? (p.transiting ? T / 2 : p.period / 4);
      sigmaTc = Math.sqrt(s0 * s0 + (m * sigmaP) ** 2);
      tcNote = `the given time moved by n = ${m} periods; sd = √(σ₀² + (n σ_P)²) with σ₀ = ${
        p.tcUncertainty !== undefined ? 'the given uncertainty' : p.transiting ? 'half the expected duration' : 'P/4'
      }`;
    } else {
      sigmaTc = p.period / 4;
      tcNote = 'centred on a sinusoid fit to the radial velocities; sd = P/4';
    }
    const where = cycles === 0 ? '' : ` for the conjunction ${cycles} periods after tc_${L} (sampled there, in the middle of the ${p.transiting ? 'transits' : 'radial velocities'}, where it is nearly uncorrelated with the period)`;
    layout.tc[i] = slot();
    add({
      name: `tc_${L}`,
      slot: layout.tc[i],
      size: 1,
      unit: 'd',
      lower: -Infinity,
      upper: Infinity,
      prior: priors.normal(sampledRel, sigmaTc),
      note: `normal(${fmt(sampledRel)}, ${fmt(sigmaTc)}) days since the epoch${where}: ${tcNote}`,
      guess: [tcRel],
      ...(cycles === 0 ? {} : { cycleShifted: { cycles, periodSlot: layout.period[i], correction: null } }),
    });

    // Eccentricity vector (√e cos ω, √e sin ω) on the unit disk.
    layout.eccentricity[i] = slot(2);
    add({
      name: `sqrtEccentricity_${L}`,
      columns: [`sqrtEcosW_${L}`, `sqrtEsinW_${L}`],
      slot: layout.eccentricity[i],
      size: 2,
      unit: '',
      lower: -1,
      upper: 1,
      prior: eccentricityDiskPrior(),
      note: 'e uniform on [0, 1) and omega uniform: uniform on the unit disk',
      // Not the origin: there the gradient in (h, k) vanishes whatever the data, so a
      // mode search started at e = 0 would never leave it.
      guess: p.eccentric ? [0.07, 0.07] : [0, 0],
      fixed: p.eccentric ? null : [0, 0],
      priorKey: `eccentricity_${L}`,
    });

    if (p.inRv && rv && sinusoids) {
      const medErr = median(rv.errors);
      let ptp = 0;
      for (let j = 0; j < rv.labels.length; j++) {
        let lo = Infinity;
        let hi = -Infinity;
        for (let k = 0; k < rv.values.length; k++) if (rv.instrument[k] === j) {
          lo = Math.min(lo, rv.values[k]);
          hi = Math.max(hi, rv.values[k]);
        }
        ptp = Math.max(ptp, hi - lo);
      }
      const kMin = 0.01 * medErr;
      const kMax = Math.max(2 * ptp, 10 * medErr);
      const fitted = sinusoids.amplitudes[i];
      const kGuess = p.semiAmplitude ?? (fitted > 0.5 * medErr ? fitted : medErr);
      layout.semiAmplitude[i] = slot();
      add({
        name: `semiAmplitude_${L}`,
      strictLower: true,
        slot: layout.semiAmplitude[i],
        size: 1,
        unit: 'm/s',
        lower: 0,
        upper: Infinity,
        prior: priors.logUniform(kMin, kMax),
        note: `logUniform(${fmt(kMin)}, ${fmt(kMax)}): scale-free, from 1% of the median error to twice the largest peak-to-peak range of one instrument`,
        guess: [Math.min(Math.max(kGuess, 1.01 * kMin), 0.99 * kMax)],
      });
    }

    if (p.transiting) {
      const depth = p.radiusRatio === undefined ? estimateDepth(lightCurves, epoch, p.period, tcRel, T) : NaN;
      const kGuess = p.radiusRatio ?? (depth > 0 ? Math.min(Math.max(Math.sqrt(depth), 0.005), 0.5) : 0.1);
      layout.radiusRatio[i] = slot();
      add({
        name: `radiusRatio_${L}`,
      strictLower: true,
        slot: layout.radiusRatio[i],
        size: 1,
        unit: '',
        lower: 0,
        upper: Infinity,
        prior: priors.uniform(0, 1),
        note: 'uniform(0, 1): any planet smaller than its star',
        guess: [kGuess],
      });
      layout.impact[i] = slot();
      add({
        name: `impactParameter_${L}`,
        slot: layout.impact[i],
        size: 1,
        unit: 'R_star',
        lower: 0,
        upper: Infinity,
        prior: priors.uniform(-1, 1),
        note: 'uniform on [0, 1 + k), so that the planet always transits: sampled as a signed b/(1 + k) uniform on (−1, 1) (the sign of cos i, to which the data are blind; the trace shows |b|)',
        guess: [Math.min(p.impactParameter ?? 0.3, 0.95 * (1 + kGuess))],
        impactOf: { radiusSlot: layout.radiusRatio[i] },
        priorKey: null,
      });
      if (system.geometry === 'scaledAxis') {
        layout.scaledAxis[i] = slot();
        add({
          name: `scaledSemiMajorAxis_${L}`,
      strictLower: true,
          slot: layout.scaledAxis[i],
          size: 1,
          unit: '',
          lower: 1,
          upper: Infinity,
          prior: priors.logUniform(1.5, 1000),
          note: 'logUniform(1.5, 1000) for a/R_* / s, s = √(1 − (b/(1 + k))²) √(1 − e²)/(1 + e sin ω): the a/R_* of a central circular transit of the same duration (scale-free, so a/R_* itself is log-uniform too away from the ends)',
          guess: [Math.min(Math.max(aGuess, 1.6), 900)],
          durationScaled: {
            power: 1,
            impactSlot: layout.impact[i],
            radiusSlot: layout.radiusRatio[i],
            eccentricitySlot: layout.eccentricity[i],
            correction: null,
          },
        });
      }
    }
  }

  // Star.
  if (transiting.length > 0 && system.geometry === 'density') {
    const minPeriod = Math.min(...transiting.map((i) => planets[i].period));
    const seconds = minPeriod * 86400;
    // ρ at which a/R_* = 1.5 for the shortest period (Seager & Mallén-Ornelas 2003), in g/cm³.
    const rhoFloor = (3 * Math.PI * 1.5 ** 3) / (6.6743e-11 * seconds * seconds) / 1000;
    const lo = Math.max(1e-3, rhoFloor);
    const given = star.density !== undefined && star.densityUncertainty > 0;
    layout.density = slot();
    add({
      name: 'starDensity',
      strictLower: true,
      slot: layout.density,
      size: 1,
      unit: 'g/cm^3',
      lower: 0,
      upper: Infinity,
      prior: given ? priors.truncatedNormal(star.density as number, star.densityUncertainty, 0, Infinity) : priors.logUniform(lo, 1000),
      note: given
        ? `normal(${fmt(star.density as number)}, ${fmt(star.densityUncertainty)}) truncated to positive values: the given stellar density`
        : `logUniform(${fmt(lo)}, 1000) for ρ/s³ (s of planet ${planets[transiting[0]].label}, see scaledSemiMajorAxis): the density a central circular transit of the same duration implies; scale-free, so ρ itself is log-uniform too away from the ends; the lower end keeps a/R_* ≥ 1.5 for the shortest period`,
      guess: [Math.min(Math.max(densityGuess, lo * 1.01), 990)],
      durationScaled: {
        power: 3,
        impactSlot: layout.impact[transiting[0]],
        radiusSlot: layout.radiusRatio[transiting[0]],
        eccentricitySlot: layout.eccentricity[transiting[0]],
        correction: given ? priors.truncatedNormal(star.density as number, star.densityUncertainty, 0, Infinity) : null,
      },
    });
  }
  for (const [which, value, unc, unit] of [
    ['starMass', star.mass, star.massUncertainty, 'M_sun'],
    ['starRadius', star.radius, star.radiusUncertainty, 'R_sun'],
  ] as const) {
    if (value === undefined) continue;
    const s = slot();
    if (which === 'starMass') layout.starMass = s;
    else layout.starRadius = s;
    add({
      name: which,
      strictLower: true,
      slot: s,
      size: 1,
      unit,
      lower: 0,
      upper: Infinity,
      prior: unc > 0 ? priors.truncatedNormal(value, unc, 0, Infinity) : priors.uniform(0, 2 * value),
      note: unc > 0 ? `normal(${fmt(value)}, ${fmt(unc)}) truncated to positive values: the given ${which === 'starMass' ? 'mass' : 'radius'}` : 'held at the given value',
      guess: [value],
      fixed: unc > 0 ? null : [value],
    });
  }

  // Instruments.
  if (rv && sinusoids) {
    const all = { ptp: 0 };
    let lo = Infinity;
    let hi = -Infinity;
    for (const v of rv.values) {
      lo = Math.min(lo, v);
      hi = Math.max(hi, v);
    }
    all.ptp = hi - lo;
    for (const [j, label] of rv.labels.entries()) {
      const vals: number[] = [];
      const errs: number[] = [];
      for (let k = 0; k < rv.values.length; k++) if (rv.instrument[k] === j) {
        vals.push(rv.values[k]);
        errs.push(rv.errors[k]);
      }
      const mean = inverseVarianceMean(vals, errs);
      const scale = Math.max(sd(vals), rms(errs));
      layout.offset[j] = slot();
      add({
        name: `offset_${label}`,
        slot: layout.offset[j],
        size: 1,
        unit: 'm/s',
        lower: -Infinity,
        upper: Infinity,
        prior: priors.normal(mean, 5 * scale),
        note: `normal(${fmt(mean)}, ${fmt(5 * scale)}): the instrument's weighted mean, sd 5 × max(scatter, rms error)`,
        guess: [sinusoids.offsets[j]],
      });
      layout.jitter[j] = slot();
      add({
        name: `jitter_${label}`,
        slot: layout.jitter[j],
        size: 1,
        unit: 'm/s',
        lower: 0,
        upper: Infinity,
        prior: priors.halfNormal(scale),
        note: `halfNormal(${fmt(scale)}): the instrument's scatter (or rms error if larger) as the scale`,
        guess: [Math.max(sinusoids.excessScatter[j], 0.1 * rms(errs))],
      });
    }
    const span = Math.max(rvSpan, 1);
    for (let d = 1; d <= system.trendDegree; d++) {
      const s = (2 * Math.max(all.ptp, median(rv.errors))) / span ** d;
      layout.trend[d - 1] = slot();
      add({
        name: d === 1 ? 'trendLinear' : 'trendQuadratic',
        slot: layout.trend[d - 1],
        size: 1,
        unit: d === 1 ? 'm/s/d' : 'm/s/d^2',
        lower: -Infinity,
        upper: Infinity,
        prior: priors.normal(0, s),
        note: `normal(0, ${fmt(s)}): twice the peak-to-peak range over the span${d === 2 ? ' squared' : ''}`,
        guess: [sinusoids.trend[d - 1]],
      });
    }
  }

  // Bands and light curves.
  const bands: string[] = [];
  const bandOf = new Int32Array(lightCurves.length);
  for (const [s, lc] of lightCurves.entries()) {
    let b = bands.indexOf(lc.band);
    if (b < 0) {
      b = bands.length;
      bands.push(lc.band);
    }
    bandOf[s] = b;
  }
  layout.limbFirst = new Int32Array(bands.length);
  layout.limbSecond = new Int32Array(bands.length);
  for (const [b, band] of bands.entries()) {
    const kipping = system.limbDarkening === 'kipping';
    layout.limbFirst[b] = slot();
    layout.limbSecond[b] = slot();
    add({
      name: `${kipping ? 'q1' : 'u1'}_${band}`,
      slot: layout.limbFirst[b],
      size: 1,
      unit: '',
      lower: kipping ? 0 : -Infinity,
      upper: kipping ? 1 : Infinity,
      prior: kipping ? priors.uniform(0, 1) : priors.uniform(0, 2),
      note: kipping ? 'uniform(0, 1): with q2 uniform, exactly the physical quadratic laws (Kipping 2013)' : 'uniform(0, 2): a box holding every physical quadratic law; give normal priors from tables instead',
      guess: [kipping ? 0.36 : 0.4],
    });
    add({
      name: `${kipping ? 'q2' : 'u2'}_${band}`,
      slot: layout.limbSecond[b],
      size: 1,
      unit: '',
      lower: kipping ? 0 : -Infinity,
      upper: kipping ? 1 : Infinity,
      prior: kipping ? priors.uniform(0, 1) : priors.uniform(-1, 1),
      note: kipping ? 'uniform(0, 1) (Kipping 2013)' : 'uniform(-1, 1): a box holding every physical quadratic law',
      guess: [kipping ? 0.3 : 0.25],
    });
  }
  for (const [s, lc] of lightCurves.entries()) {
    const med = median(lc.flux);
    const scatter = Math.max(sd(lc.flux), median(lc.errors));
    layout.baseline[s] = slot();
    add({
      name: `baseline_${lc.label}`,
      strictLower: true,
      slot: layout.baseline[s],
      size: 1,
      unit: 'flux',
      lower: 0,
      upper: Infinity,
      prior: priors.normal(med, 10 * scatter),
      note: `normal(${fmt(med)}, ${fmt(10 * scatter)}): the median flux, sd 10 × the scatter`,
      guess: [med],
    });
    layout.fluxJitter[s] = slot();
    add({
      name: `fluxJitter_${lc.label}`,
      slot: layout.fluxJitter[s],
      size: 1,
      unit: 'flux',
      lower: 0,
      upper: Infinity,
      prior: priors.halfNormal(scatter),
      note: `halfNormal(${fmt(scatter)}): the light curve's scatter (or median error if larger) as the scale`,
      guess: [0.2 * median(lc.errors)],
    });
    if (lc.dilution) {
      layout.dilution[s] = slot();
      add({
        name: `dilution_${lc.label}`,
        slot: layout.dilution[s],
        size: 1,
        unit: '',
        lower: 0,
        upper: Infinity,
        prior: priors.halfNormal(0.5),
        note: 'halfNormal(0.5): third light up to about the target\'s flux; nearly degenerate with k without outside information',
        guess: [0.05],
      });
    }
  }
  layout.length = length;

  applyUserSettings(entries, system);
  return { layout, entries, bands, bandOf, transiting, durationGuess };
}

/** Applies `priors`, `fixed` and `start`, checking every name. */
function applyUserSettings(entries: PlanEntry[], system: PreparedSystem): void {
  const byPriorKey = new Map<string, number>();
  const byColumn = new Map<string, [number, number]>();
  for (const [i, e] of entries.entries()) {
    if (e.priorKey !== null) byPriorKey.set(e.priorKey, i);
    e.columns.forEach((c, k) => byColumn.set(c, [i, k]));
  }
  const known = (m: Map<string, unknown>): string => [...m.keys()].join(', ');

  for (const [key, value] of Object.entries(system.priors)) {
    const i = byPriorKey.get(key);
    if (i === undefined) {
      const why = key.startsWith('impactParameter_') ? ' (the impact parameter is sampled as b/(1 + k), uniform; it can be fixed but not given another prior)' : '';
      throw new FitSettingsError(`priors.${key}`, value, `a parameter of this model${why}: ${known(byPriorKey)}`);
    }
    const e = entries[i];
    const prior: ScalarPrior = resolveScalarPrior(value, `priors.${key}`);
    if (e.fixed !== null && e.size === 2) {
      throw new FitSettingsError(`priors.${key}`, prior.description, `no prior: planet ${key.slice('eccentricity_'.length)} is circular (set eccentric: true to fit its eccentricity)`);
    }
    if (e.size === 2) {
      if (prior.lower > 0 || !(prior.upper > 0)) {
        throw new FitSettingsError(`priors.${key}`, prior.description, 'a prior on the eccentricity whose support starts at 0 (it may end below 1)');
      }
      entries[i] = { ...e, prior: eccentricityDiskPrior(prior), note: `eccentricity ~ ${prior.description} (given), omega uniform` };
    } else if (e.cycleShifted && !Number.isFinite(prior.lower) && !Number.isFinite(prior.upper)) {
      entries[i] = { ...e, note: `${prior.description} (given)`, cycleShifted: { ...e.cycleShifted, correction: prior } };
    } else if (e.cycleShifted) {
      // A bounded prior on tc bounds the sampled coordinate itself: tc is sampled directly.
      const { cycleShifted: _, ...rest } = e;
      entries[i] = { ...rest, prior, note: `${prior.description} (given)`, guess: [...e.guess] };
    } else if (e.durationScaled) {
      entries[i] = { ...e, prior, note: `${prior.description} (given)`, durationScaled: { ...e.durationScaled, correction: prior } };
    } else {
      // A prior given for a value held by default (a stellar mass without uncertainty) frees it.
      entries[i] = { ...e, prior, note: `${prior.description} (given)`, fixed: null };
    }
  }

  const fixedByEntry = new Map<number, number[]>();
  for (const [key, value] of Object.entries(system.fixed)) {
    const hit = byColumn.get(key);
    if (hit === undefined) throw new FitSettingsError(`fixed.${key}`, value, `a parameter of this model: ${known(byColumn)}`);
    const [i, k] = hit;
    const e = entries[i];
    if (e.priorKey !== null && e.priorKey in system.priors) {
      throw new FitSettingsError(`fixed.${key}`, value, `either a fixed value or a prior (priors.${e.priorKey} is given too)`);
    }
    const v = fixedByEntry.get(i) ?? (e.size === 2 ? [NaN, NaN] : [NaN]);
    v[k] = value;
    fixedByEntry.set(i, v);
  }
  for (const [i, v] of fixedByEntry) {
    const e = entries[i];
    if (v.some((x) => Number.isNaN(x))) {
      throw new FitSettingsError(`fixed.${e.columns.find((_, k) => Number.isNaN(v[k]))}`, undefined, `a value: ${e.columns.join(' and ')} are fixed together`);
    }
    checkInside(e, v, 'fixed');
    entries[i] = { ...e, fixed: v, guess: [...v] };
  }

  for (const [key, value] of Object.entries(system.start)) {
    const hit = byColumn.get(key);
    if (hit === undefined) throw new FitSettingsError(`start.${key}`, value, `a parameter of this model: ${known(byColumn)}`);
    const [i, k] = hit;
    const e = entries[i];
    const g = [...e.guess];
    g[k] = value;
    checkInside(e, g, 'start');
    entries[i] = { ...e, guess: g };
  }
}

function checkInside(e: PlanEntry, v: readonly number[], where: string): void {
  const field = (k: number): string => `${where}.${e.columns[k]}`;
  if (e.size === 2) {
    if (!(Number.isFinite(v[0]) && Number.isFinite(v[1]) && v[0] * v[0] + v[1] * v[1] < 1)) {
      throw new FitSettingsError(field(0), v[0], `a point inside the unit disk together with ${e.columns[1]} (eccentricity < 1)`);
    }
    return;
  }
  const x = v[0];
  if (where === 'fixed') {
    const ok = Number.isFinite(x) && (e.strictLower ? x > e.lower : x >= e.lower) && x <= e.upper;
    if (!ok) throw new FitSettingsError(field(0), x, `a value in ${e.strictLower ? '(' : '['}${e.lower}, ${e.upper}] for ${e.name}`);
    return;
  }
  // A starting value must lie strictly inside the sampled support.
  const prior = e.prior as ScalarPrior;
  const lo = Math.max(e.lower, prior.lower);
  // An impact parameter may start anywhere in (0, 1 + k); the guess is clamped there later.
  const hi = e.impactOf ? Infinity : Math.min(e.upper, prior.upper);
  if (!(Number.isFinite(x) && x > lo && x < hi)) {
    throw new FitSettingsError(field(0), x, `a value in (${lo}, ${hi}) for ${e.name}`);
  }
}

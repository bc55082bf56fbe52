/**
 * The log-likelihood of a planetary system over its physical vector Φ
 * (`physicalLayout.ts`), in float64, with the exact gradient ∂ log L/∂Φ: the fused
 * radial-velocity likelihood of `orbit/` and one fused light-curve likelihood of
 * `transit/` per light curve, fed from Φ and chained back to it.
 *
 * Shared quantities: a planet's P, tc and (√e cos ω, √e sin ω) enter both kinds of data.
 * The radial-velocity kernel takes the root form (h, k) = (√e cos ω, √e sin ω) itself;
 * the light-curve kernel takes (e, ω), chained by
 *   ∂/∂h = 2h ∂/∂e − k (∂/∂ω)/e,   ∂/∂k = 2k ∂/∂e + h (∂/∂ω)/e,
 * with (∂/∂ω)/e → 0 taken at e = 0 exactly (there the light curve does not depend on ω
 * and both partials vanish with h = k = 0). In the density geometry
 * a/R_* = (G ρ P²/(3π))^(1/3) (Seager & Mallén-Ornelas 2003), so
 * ∂(a/R_*)/∂P = 2(a/R_*)/(3P) and ∂(a/R_*)/∂ρ = (a/R_*)/(3ρ). Limb darkening in the
 * (q1, q2) form maps by u1 = 2√q1 q2, u2 = √q1 (1 − 2 q2) (Kipping 2013).
 * Nothing is allocated per call.
 */
import { GRAVITATIONAL_CONSTANT, SECONDS_PER_DAY } from '../orbit/constants.js';
import { createRvLikelihood, type RvLikelihood } from '../orbit/rvLikelihood.js';
import { createLightCurveLikelihood, type LightCurveLikelihood } from '../transit/lightCurveLikelihood.js';
import type { ParameterPlan } from './parameterPlan.js';
import type { PreparedSystem } from './prepareInput.js';

const PLANET_RV = 5;
const PLANET_LC = 7;
/** G · (1000 kg/m³ per g/cm³) · (86400 s/day)² / (3π): a/R_*³ = this × ρ[g/cm³] × P[d]². */
const DENSITY_AXIS_FACTOR = (GRAVITATIONAL_CONSTANT * 1000 * SECONDS_PER_DAY * SECONDS_PER_DAY) / (3 * Math.PI);

/** a/R_* from a stellar density (g/cm³) and a period (days). */
export function scaledAxisOf(density: number, period: number): number {
  return Math.cbrt(DENSITY_AXIS_FACTOR * density * period * period);
}

/** The system's log-likelihood, bound to its data (see the file notes). */
export interface SystemLikelihood {
  /** log L at Φ; with `grad`, also writes ∂ log L/∂Φ there (overwriting it). */
  evaluate(phi: Float64Array, grad: Float64Array | null): number;
  /** The radial-velocity likelihood (times relative to the epoch), or null. */
  readonly rv: RvLikelihood | null;
  /** Planet indices in the radial-velocity vector's order. */
  readonly rvPlanets: readonly number[];
  /** One light-curve likelihood per light curve (times relative to the epoch). */
  readonly lightCurves: readonly LightCurveLikelihood[];
  /** Fills and returns the radial-velocity parameter vector at Φ (a buffer reused between calls). */
  rvVector(phi: Float64Array): Float64Array;
  /**
   * Fills and returns light curve `s`'s parameter vector at Φ (a buffer reused between
   * calls), or null when a derived value (u1, u2 from q1, q2) is outside its domain.
   */
  lightCurveVector(phi: Float64Array, s: number): Float64Array | null;
}

/** Builds the system likelihood for the plan and data. */
export function createSystemLikelihood(system: PreparedSystem, plan: ParameterPlan): SystemLikelihood {
  const { layout, transiting, bandOf } = plan;
  const epoch = system.epoch;
  const densityGeometry = layout.density >= 0;
  const kipping = system.limbDarkening === 'kipping';

  // Radial velocities.
  const rvPlanets: number[] = [];
  for (let i = 0; i < system.planets.length; i++) if (layout.semiAmplitude[i] >= 0) rvPlanets.push(i);
  let rv: RvLikelihood | null = null;
  let rvParams = new Float64Array(0);
  let rvGrad = new Float64Array(0);
  const J = system.rv ? system.rv.labels.length : 0;
  if (system.rv) {
    const t = system.rv.times.map((x) => x - epoch);
    rv = createRvLikelihood({
      times: t,
      values: system.rv.values,
      errors: system.rv.errors,
      instrument: system.rv.instrument,
      instruments: J,
      planets: rvPlanets.length,
      eccentricityForm: 'root',
      trendDegree: system.trendDegree,
      trendEpoch: 0,
    });
    rvParams = new Float64Array(rv.dim);
    rvGrad = new Float64Array(rv.dim);
  }

  // Light curves.
  const nT = transiting.length;
  const lightCurves = system.lightCurves.map((lc) =>
    createLightCurveLikelihood({
      times: lc.times.map((x) => x - epoch),
      flux: lc.flux,
      errors: lc.errors,
      exposureTime: lc.exposure,
      subSamples: lc.subSamples,
      planets: Math.max(nT, 1),
      angle: 'impact',
      dilution: lc.dilution,
    }),
  );
  const lcParams = lightCurves.map((l) => new Float64Array(l.dim));
  const lcGrad = lightCurves.map((l) => new Float64Array(l.dim));
  // Per transiting planet: e, ω, a/R_*, ∂(a/R_*)/∂P, ∂(a/R_*)/∂ρ; accumulated gradients.
  const geo = new Float64Array(nT * 5);
  const acc = new Float64Array(nT * PLANET_LC);
  const nB = plan.bands.length;
  const limb = new Float64Array(nB * 6); // u1, u2, ∂u1/∂a, ∂u1/∂b, ∂u2/∂a, ∂u2/∂b
  const limbAcc = new Float64Array(nB * 2);

  function fillRv(phi: Float64Array): void {
    for (const [p, i] of rvPlanets.entries()) {
      const o = p * PLANET_RV;
      rvParams[o] = phi[layout.period[i]];
      rvParams[o + 1] = phi[layout.tc[i]];
      rvParams[o + 2] = phi[layout.eccentricity[i]];
      rvParams[o + 3] = phi[layout.eccentricity[i] + 1];
      rvParams[o + 4] = phi[layout.semiAmplitude[i]];
    }
    if (rv) {
      for (let j = 0; j < J; j++) {
        rvParams[rv.offsetIndex + j] = phi[layout.offset[j]];
        rvParams[rv.jitterIndex + j] = phi[layout.jitter[j]];
      }
      for (let d = 0; d < layout.trend.length; d++) rvParams[rv.trendIndex + d] = phi[layout.trend[d]];
    }
  }

  /** Per-call geometry and limb darkening; false when outside the domain. */
  function prepareTransits(phi: Float64Array): boolean {
    for (const [j, i] of transiting.entries()) {
      const h = phi[layout.eccentricity[i]];
      const k = phi[layout.eccentricity[i] + 1];
      const e = h * h + k * k;
      const o = j * 5;
      geo[o] = e;
      geo[o + 1] = e > 0 ? Math.atan2(k, h) : 0;
      const P = phi[layout.period[i]];
      if (densityGeometry) {
        const rho = phi[layout.density];
        if (!(rho > 0) || !(P > 0)) return false;
        const aR = scaledAxisOf(rho, P);
        geo[o + 2] = aR;
        geo[o + 3] = (2 * aR) / (3 * P);
        geo[o + 4] = aR / (3 * rho);
      } else {
        geo[o + 2] = phi[layout.scaledAxis[i]];
        geo[o + 3] = 0;
        geo[o + 4] = 0;
      }
    }
    for (let b = 0; b < nB; b++) {
      const a = phi[layout.limbFirst[b]];
      const c = phi[layout.limbSecond[b]];
      const o = b * 6;
      if (kipping) {
        if (!(a > 0 && a <= 1 && c >= 0 && c <= 1)) return false;
        const r = Math.sqrt(a);
        limb[o] = 2 * r * c;
        limb[o + 1] = r * (1 - 2 * c);
        limb[o + 2] = c / r;
        limb[o + 3] = 2 * r;
        limb[o + 4] = (1 - 2 * c) / (2 * r);
        limb[o + 5] = -2 * r;
      } else {
        limb[o] = a;
        limb[o + 1] = c;
        limb[o + 2] = 1;
        limb[o + 3] = 0;
        limb[o + 4] = 0;
        limb[o + 5] = 1;
      }
    }
    return true;
  }

  function fillLightCurve(phi: Float64Array, s: number): Float64Array {
    const v = lcParams[s];
    for (const [j, i] of transiting.entries()) {
      const o = j * PLANET_LC;
      v[o] = phi[layout.period[i]];
      v[o + 1] = phi[layout.tc[i]];
      v[o + 2] = geo[j * 5];
      v[o + 3] = geo[j * 5 + 1];
      v[o + 4] = geo[j * 5 + 2];
      v[o + 5] = phi[layout.impact[i]];
      v[o + 6] = phi[layout.radiusRatio[i]];
    }
    const l = lightCurves[s];
    const at = nT * PLANET_LC;
    const b = bandOf[s];
    v[at] = limb[b * 6];
    v[at + 1] = limb[b * 6 + 1];
    v[l.baselineIndex] = phi[layout.baseline[s]];
    v[l.jitterIndex] = phi[layout.fluxJitter[s]];
    if (l.dilutionIndex >= 0) v[l.dilutionIndex] = phi[layout.dilution[s]];
    return v;
  }

  function evaluate(phi: Float64Array, grad: Float64Array | null): number {
    if (grad) grad.fill(0);
    let total = 0;
    if (rv) {
      fillRv(phi);
      const v = grad ? rv.logLikelihoodGrad(rvParams, rvGrad) : rv.logLikelihood(rvParams);
      if (!Number.isFinite(v)) return -Infinity;
      total += v;
      if (grad) {
        for (const [p, i] of rvPlanets.entries()) {
          const o = p * PLANET_RV;
          grad[layout.period[i]] += rvGrad[o];
          grad[layout.tc[i]] += rvGrad[o + 1];
          grad[layout.eccentricity[i]] += rvGrad[o + 2];
          grad[layout.eccentricity[i] + 1] += rvGrad[o + 3];
          grad[layout.semiAmplitude[i]] += rvGrad[o + 4];
        }
        for (let j = 0; j < J; j++) {
          grad[layout.offset[j]] += rvGrad[rv.offsetIndex + j];
          grad[layout.jitter[j]] += rvGrad[rv.jitterIndex + j];
        }
        for (let d = 0; d < layout.trend.length; d++) grad[layout.trend[d]] += rvGrad[rv.trendIndex + d];
      }
    }
    if (lightCurves.length > 0 && nT > 0) {
      if (!prepareTransits(phi)) return -Infinity;
      acc.fill(0);
      limbAcc.fill(0);
      for (let s = 0; s < lightCurves.length; s++) {
        const l = lightCurves[s];
        const v = fillLightCurve(phi, s);
        const value = grad ? l.logLikelihoodGrad(v, lcGrad[s]) : l.logLikelihood(v);
        if (!Number.isFinite(value)) return -Infinity;
        total += value;
        if (!grad) continue;
        const g = lcGrad[s];
        for (let q = 0; q < nT * PLANET_LC; q++) acc[q] += g[q];
        const at = nT * PLANET_LC;
        limbAcc[bandOf[s] * 2] += g[at];
        limbAcc[bandOf[s] * 2 + 1] += g[at + 1];
        grad[layout.baseline[s]] += g[l.baselineIndex];
        grad[layout.fluxJitter[s]] += g[l.jitterIndex];
        if (l.dilutionIndex >= 0) grad[layout.dilution[s]] += g[l.dilutionIndex];
      }
      if (grad) {
        for (const [j, i] of transiting.entries()) {
          const o = j * PLANET_LC;
          const gAxis = acc[o + 4];
          grad[layout.period[i]] += acc[o] + gAxis * geo[j * 5 + 3];
          grad[layout.tc[i]] += acc[o + 1];
          const e = geo[j * 5];
          if (e > 0) {
            const h = phi[layout.eccentricity[i]];
            const k = phi[layout.eccentricity[i] + 1];
            const wOverE = acc[o + 3] / e;
            grad[layout.eccentricity[i]] += 2 * h * acc[o + 2] - k * wOverE;
            grad[layout.eccentricity[i] + 1] += 2 * k * acc[o + 2] + h * wOverE;
          }
          if (densityGeometry) grad[layout.density] += gAxis * geo[j * 5 + 4];
          else grad[layout.scaledAxis[i]] += gAxis;
          grad[layout.impact[i]] += acc[o + 5];
          grad[layout.radiusRatio[i]] += acc[o + 6];
        }
        for (let b = 0; b < nB; b++) {
          const g1 = limbAcc[2 * b];
          const g2 = limbAcc[2 * b + 1];
          const o = b * 6;
          grad[layout.limbFirst[b]] += g1 * limb[o + 2] + g2 * limb[o + 4];
          grad[layout.limbSecond[b]] += g1 * limb[o + 3] + g2 * limb[o + 5];
        }
      }
    }
    return total;
  }

  return {
    evaluate,
    rv,
    rvPlanets,
    lightCurves,
    rvVector(phi) {
      fillRv(phi);
      return rvParams;
    },
    lightCurveVector(phi, s) {
      if (!prepareTransits(phi)) return null;
      return fillLightCurve(phi, s);
    },
  };
}

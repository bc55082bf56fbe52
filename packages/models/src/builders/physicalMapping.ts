/**
 * The map from the compiled model's constrained vector θ (the sampled parameters in
 * their sampled form) to the physical vector Φ, its inverse, and the pull-back of ∂/∂Φ
 * to ∂/∂θ. Most entries are copied; three are sampled in a transformed form:
 *
 * 0. a conjunction time as T = tc + c P, the conjunction c periods after tc
 *    (`cycleShifted`): tc = T − c P, so ∂/∂T = ∂/∂tc and ∂/∂P gains −c ∂/∂tc;
 * 1. an impact parameter as β = b/(1 + k) on (−1, 1): b = β (1 + k), so ∂/∂β =
 *    (1 + k) ∂/∂b and ∂/∂k gains β ∂/∂b;
 * 2. the stellar density and a/R_* as x₀ = x/s^p (`durationScale.ts`): x = x₀ s^p, with s
 *    from b, k and the eccentricity vector of the reference planet, so ∂/∂x₀ = s^p ∂/∂x
 *    and each input y of s gains p (x/s) (∂s/∂y) ∂/∂x.
 *
 * The fill runs copies, then 0, 1, 2; the pull-back runs 2, 1, 0, then copies. Priors: a
 * prior given for tc itself is made exact by adding ln p(tc) − ln p(T). For
 * density and a/R_* the default log-uniform prior is placed on x₀ (scale-free, so also
 * log-uniform in x away from its ends), and a prior given for x itself is made exact by
 * adding ln p(x) − ln p(x₀) + p ln s.
 */
import type { ScalarPrior } from '@apsis/core';
import { DS_B, DS_H, DS_K, DS_KE, DS_VALUE, durationScaleInto } from './durationScale.js';
import type { PlanEntry } from './parameterPlan.js';

/** θ ↔ Φ for a list of sampled entries at the given θ offsets. */
export interface PhysicalMapping {
  /** Writes Φ (its fixed slots already set) from θ; false when a scale factor is undefined. */
  fill(theta: Float64Array, phi: Float64Array): boolean;
  /**
   * The prior corrections at (θ, Φ) after `fill`; with `gPhi`, adds their ∂/∂Φ there
   * (their ∂/∂θ terms are added by `pullBack`).
   */
  correction(theta: Float64Array, phi: Float64Array, gPhi: Float64Array | null): number;
  /** Writes ∂/∂θ from ∂/∂Φ (`gPhi` is modified), including the corrections' direct terms. */
  pullBack(theta: Float64Array, phi: Float64Array, gPhi: Float64Array, gTheta: Float64Array): void;
  /** Writes θ for a complete physical vector Φ (the inverse of `fill`); false when undefined. */
  invert(phi: Float64Array, theta: Float64Array): boolean;
}

interface DurationStage {
  readonly n: number;
  readonly slot: number;
  readonly power: number;
  readonly inputs: readonly [number, number, number, number]; // b, k, h, k_e slots
  readonly correction: ScalarPrior | null;
  readonly s: Float64Array; // s, ∂s/∂b, ∂s/∂k, ∂s/∂h, ∂s/∂k_e at the last fill
}

interface ShiftStage {
  readonly n: number;
  readonly slot: number;
  readonly periodSlot: number;
  readonly cycles: number;
  readonly prior: ScalarPrior;
  readonly correction: ScalarPrior | null;
}

/** Builds the mapping for `entries` (the sampled ones) with θ offsets `at`. */
export function createPhysicalMapping(entries: readonly PlanEntry[], at: readonly number[]): PhysicalMapping {
  const plain: number[] = [];
  const impacts: number[] = [];
  const durations: DurationStage[] = [];
  const shifts: ShiftStage[] = [];
  entries.forEach((e, n) => {
    if (e.cycleShifted) {
      const c = e.cycleShifted;
      shifts.push({ n, slot: e.slot, periodSlot: c.periodSlot, cycles: c.cycles, prior: e.prior as ScalarPrior, correction: c.correction });
    } else if (e.impactOf) impacts.push(n);
    else if (e.durationScaled) {
      const d = e.durationScaled;
      durations.push({
        n,
        slot: e.slot,
        power: d.power,
        inputs: [d.impactSlot, d.radiusSlot, d.eccentricitySlot, d.eccentricitySlot + 1],
        correction: d.correction,
        s: new Float64Array(5),
      });
    } else plain.push(n);
  });

  return {
    fill(theta, phi) {
      for (const n of plain) {
        const e = entries[n];
        for (let k = 0; k < e.size; k++) phi[e.slot + k] = theta[at[n] + k];
      }
      for (const c of shifts) phi[c.slot] = theta[at[c.n]] - c.cycles * phi[c.periodSlot];
      for (const n of impacts) {
        const e = entries[n];
        phi[e.slot] = theta[at[n]] * (1 + phi[e.impactOf!.radiusSlot]);
      }
      for (const c of durations) {
        const [b, k, h, ke] = c.inputs;
        if (!durationScaleInto(phi[b], phi[k], phi[h], phi[ke], c.s)) return false;
        phi[c.slot] = theta[at[c.n]] * c.s[DS_VALUE] ** c.power;
      }
      return true;
    },
    correction(theta, phi, gPhi) {
      let total = 0;
      for (const c of shifts) {
        if (!c.correction) continue;
        total += c.correction.logDensity(phi[c.slot]) - c.prior.logDensity(theta[at[c.n]]);
        if (gPhi) gPhi[c.slot] += c.correction.logDensityDerivative(phi[c.slot]);
      }
      for (const c of durations) {
        if (!c.correction) continue;
        const x = phi[c.slot];
        const x0 = theta[at[c.n]];
        const s = c.s[DS_VALUE];
        total += c.correction.logDensity(x) - c.correction.logDensity(x0) + c.power * Math.log(s);
        if (gPhi) {
          gPhi[c.slot] += c.correction.logDensityDerivative(x);
          const [b, k, h, ke] = c.inputs;
          const f = c.power / s;
          gPhi[b] += f * c.s[DS_B];
          gPhi[k] += f * c.s[DS_K];
          gPhi[h] += f * c.s[DS_H];
          gPhi[ke] += f * c.s[DS_KE];
        }
      }
      return total;
    },
    pullBack(theta, phi, gPhi, gTheta) {
      for (let i = durations.length - 1; i >= 0; i--) {
        const c = durations[i];
        const gx = gPhi[c.slot];
        const s = c.s[DS_VALUE];
        let direct = gx * s ** c.power;
        if (c.correction) direct -= c.correction.logDensityDerivative(theta[at[c.n]]);
        gTheta[at[c.n]] = direct;
        const f = (gx * c.power * phi[c.slot]) / s;
        const [b, k, h, ke] = c.inputs;
        gPhi[b] += f * c.s[DS_B];
        gPhi[k] += f * c.s[DS_K];
        gPhi[h] += f * c.s[DS_H];
        gPhi[ke] += f * c.s[DS_KE];
      }
      for (const n of impacts) {
        const e = entries[n];
        const kSlot = e.impactOf!.radiusSlot;
        const gb = gPhi[e.slot];
        gTheta[at[n]] = gb * (1 + phi[kSlot]);
        gPhi[kSlot] += gb * theta[at[n]];
      }
      for (const c of shifts) {
        const g = gPhi[c.slot];
        gTheta[at[c.n]] = c.correction ? g - c.prior.logDensityDerivative(theta[at[c.n]]) : g;
        gPhi[c.periodSlot] -= c.cycles * g;
      }
      for (const n of plain) {
        const e = entries[n];
        for (let k = 0; k < e.size; k++) gTheta[at[n] + k] = gPhi[e.slot + k];
      }
    },
    invert(phi, theta) {
      for (const n of plain) {
        const e = entries[n];
        for (let k = 0; k < e.size; k++) theta[at[n] + k] = phi[e.slot + k];
      }
      for (const c of shifts) theta[at[c.n]] = phi[c.slot] + c.cycles * phi[c.periodSlot];
      for (const n of impacts) {
        const e = entries[n];
        theta[at[n]] = phi[e.slot] / (1 + phi[e.impactOf!.radiusSlot]);
      }
      for (const c of durations) {
        const [b, k, h, ke] = c.inputs;
        if (!durationScaleInto(phi[b], phi[k], phi[h], phi[ke], c.s)) return false;
        theta[at[c.n]] = phi[c.slot] / c.s[DS_VALUE] ** c.power;
      }
      return true;
    },
  };
}

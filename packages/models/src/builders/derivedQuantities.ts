/**
 * The trace columns of a built model: its sampled parameters (physical values) and the
 * derived quantities, computed in float64 from the physical vector Φ for every draw.
 *
 * Formulas (units in the column table of docs/fitting-radial-velocities.md):
 * - e = h² + k², ω = atan2(k, h) for (h, k) = (√e cos ω, √e sin ω), in degrees, taken
 *   within 180° of its value at the model's centre when e ≥ 0.02 there (so a posterior
 *   around ±180° does not split in two), else in (−180°, 180°];
 * - time of periastron tp = tc − P M_c/(2π) + n P, M_c the mean anomaly at conjunction
 *   (`orbit/epochs.ts`), with the whole number n that puts tp nearest to the
 *   periastron time at the model's centre (its posterior mode) when e ≥ 0.02 there, so
 *   that draws do not jump by a period where M_c crosses ±π (else n = 0);
 * - planet mass from K by the mass function (m sin i)³/(M_* + m)² =
 *   P K³ (1 − e²)^(3/2)/(2π G M_sun) (Lovis & Fischer 2010, eq. 1, inverted): the
 *   minimum mass with sin i = 1, the true mass with the transit's inclination;
 * - semi-major axis a = [G (M_* + m) P²/(4π²)]^(1/3) (Kepler's third law), in au;
 * - inclination from b = (a/R_*) cos i (1 − e²)/(1 + e sin ω) (Winn 2010, eq. 7);
 * - T14, T23 = (P/π) asin[√((1 ± k)² − b²)/((a/R_*) sin i)] √(1 − e²)/(1 + e sin ω)
 *   (Winn 2010, eqs. 14–16), in hours, 0 when the contact does not happen;
 * - stellar density ρ_* = 3π (a/R_*)³/(G P²) (Seager & Mallén-Ornelas 2003), g/cm³;
 * - planet radius k R_*, in Earth and Jupiter radii (IAU 2015 B3 nominal radii).
 */
import { conjunctionMeanAnomalyUnchecked } from '../orbit/anomalies.js';
import {
  AU_M,
  EARTH_MASS_IN_SOLAR,
  EARTH_RADIUS_M,
  GRAVITATIONAL_CONSTANT,
  JUPITER_MASS_IN_SOLAR,
  JUPITER_RADIUS_M,
  SECONDS_PER_DAY,
  SOLAR_GM,
  SOLAR_MASS_KG,
  SOLAR_RADIUS_M,
} from '../orbit/constants.js';
import type { ParameterPlan } from './parameterPlan.js';
import type { PreparedSystem } from './prepareInput.js';
import { scaledAxisOf } from './systemLikelihood.js';

const DEG = 180 / Math.PI;

/** Planet mass (solar masses) from K (m/s), P (days), e, M_* (solar masses) and sin i. */
export function massFromSemiAmplitude(K: number, P: number, e: number, starMass: number, sinI: number): number {
  const f = (P * SECONDS_PER_DAY * K * K * K * Math.pow(1 - e * e, 1.5)) / (2 * Math.PI * SOLAR_GM);
  if (!(f > 0) || !(sinI > 0) || !(starMass > 0)) return NaN;
  const logF = Math.log(f);
  const logSin = Math.log(sinI);
  let x = Math.log(Math.cbrt(f * starMass * starMass) / sinI);
  for (let it = 0; it < 60; it++) {
    const m = Math.exp(x);
    const g = 3 * x + 3 * logSin - 2 * Math.log(starMass + m) - logF;
    const step = g / (3 - (2 * m) / (starMass + m));
    x -= step;
    if (Math.abs(step) < 1e-15) break;
  }
  return Math.exp(x);
}

/** Semi-major axis (au) for P (days) and a total mass (solar masses). */
export function semiMajorAxisAuOf(P: number, totalMass: number): number {
  const s = P * SECONDS_PER_DAY;
  return Math.cbrt((SOLAR_GM * totalMass * s * s) / (4 * Math.PI * Math.PI)) / AU_M;
}

/** Winn (2010) eq. 14/15 with the eq. 16 factor: duration in days between the contacts at reach 1 ± k. */
export function contactDuration(P: number, aR: number, reach: number, b: number, sinI: number, factor: number): number {
  const chord2 = reach * reach - b * b;
  if (!(chord2 > 0)) return 0;
  return (P / Math.PI) * Math.asin(Math.min(1, Math.sqrt(chord2) / (aR * sinI))) * factor;
}

/** The trace columns of a model. */
export interface OutputColumns {
  readonly names: readonly string[];
  /** Unit of each column by name ('' for dimensionless). */
  readonly units: Readonly<Record<string, string>>;
  /** Writes every column at the physical vector Φ into `out`. */
  write(phi: Float64Array, out: Float64Array): void;
  /** Takes the periastron times and arguments of periastron at Φ as the references that choose their branches. */
  anchor(phi: Float64Array): void;
}

/** Builds the column list and its writer for a plan. */
export function outputColumns(system: PreparedSystem, plan: ParameterPlan): OutputColumns {
  const { layout, entries } = plan;
  const names: string[] = [];
  const units: Record<string, string> = {};
  const writers: ((phi: Float64Array, out: Float64Array, at: number) => void)[] = [];
  const column = (name: string, unit: string, f: (phi: Float64Array) => number): void => {
    names.push(name);
    units[name] = unit;
    writers.push((phi, out, at) => {
      out[at] = f(phi);
    });
  };

  for (const e of entries) {
    if (e.fixed !== null) continue;
    // Impact parameters are sampled with a sign (that of cos i); the trace shows |b|.
    if (e.impactOf) column(e.columns[0], e.unit, (phi) => Math.abs(phi[e.slot]));
    else e.columns.forEach((c, k) => column(c, e.unit, (phi) => phi[e.slot + k]));
  }

  const tpReference = new Float64Array(system.planets.length).fill(NaN);
  const omegaReference = new Float64Array(system.planets.length).fill(NaN);
  const starMass = (phi: Float64Array): number => phi[layout.starMass];
  const starRadius = (phi: Float64Array): number => phi[layout.starRadius];
  const hasMass = layout.starMass >= 0;
  const hasRadius = layout.starRadius >= 0;

  for (const [i, p] of system.planets.entries()) {
    const L = p.label;
    const eccEntry = entries.find((e) => e.slot === layout.eccentricity[i]);
    const eccentric = eccEntry !== undefined && (eccEntry.fixed === null || eccEntry.fixed.some((x) => x !== 0));
    const h = (phi: Float64Array): number => phi[layout.eccentricity[i]];
    const k = (phi: Float64Array): number => phi[layout.eccentricity[i] + 1];
    const ecc = (phi: Float64Array): number => h(phi) ** 2 + k(phi) ** 2;
    const omega = (phi: Float64Array): number => (ecc(phi) > 0 ? Math.atan2(k(phi), h(phi)) : 0);
    const P = (phi: Float64Array): number => phi[layout.period[i]];
    const aR = (phi: Float64Array): number =>
      layout.density >= 0 ? scaledAxisOf(phi[layout.density], P(phi)) : phi[layout.scaledAxis[i]];
    const cosI = (phi: Float64Array): number => {
      const e = ecc(phi);
      return (Math.abs(phi[layout.impact[i]]) * (1 + e * Math.sin(omega(phi)))) / (aR(phi) * (1 - e * e));
    };
    const sinI = (phi: Float64Array): number => Math.sqrt(Math.max(0, 1 - cosI(phi) ** 2));
    const inRv = layout.semiAmplitude[i] >= 0;
    const minimumMass = (phi: Float64Array): number =>
      massFromSemiAmplitude(phi[layout.semiAmplitude[i]], P(phi), ecc(phi), starMass(phi), 1);
    const trueMass = (phi: Float64Array): number =>
      massFromSemiAmplitude(phi[layout.semiAmplitude[i]], P(phi), ecc(phi), starMass(phi), sinI(phi));
    const planetMass = p.transiting && inRv ? trueMass : inRv ? minimumMass : () => 0;

    if (eccentric) {
      column(`eccentricity_${L}`, '', ecc);
      column(`omega_${L}`, 'deg', (phi) => {
        const w = omega(phi) * DEG;
        const ref = omegaReference[i];
        return Number.isFinite(ref) ? w + 360 * Math.round((ref - w) / 360) : w;
      });
      column(`periastronTime_${L}`, 'd', (phi) => {
        const period = P(phi);
        const tp = phi[layout.tc[i]] - (period * conjunctionMeanAnomalyUnchecked(ecc(phi), omega(phi))) / (2 * Math.PI);
        const ref = tpReference[i];
        return Number.isFinite(ref) ? tp + period * Math.round((ref - tp) / period) : tp;
      });
    }
    if (hasMass) column(`semiMajorAxis_${L}`, 'au', (phi) => semiMajorAxisAuOf(P(phi), starMass(phi) + planetMass(phi)));
    if (inRv && hasMass) {
      column(`minimumMass_${L}`, 'M_earth', (phi) => minimumMass(phi) / EARTH_MASS_IN_SOLAR);
      column(`minimumMassJupiter_${L}`, 'M_jup', (phi) => minimumMass(phi) / JUPITER_MASS_IN_SOLAR);
    }
    if (p.transiting) {
      const factor = (phi: Float64Array): number => {
        const e = ecc(phi);
        return Math.sqrt(1 - e * e) / (1 + e * Math.sin(omega(phi)));
      };
      const kr = (phi: Float64Array): number => phi[layout.radiusRatio[i]];
      const b = (phi: Float64Array): number => Math.abs(phi[layout.impact[i]]);
      column(`inclination_${L}`, 'deg', (phi) => Math.acos(Math.min(1, Math.max(-1, cosI(phi)))) * DEG);
      if (layout.density >= 0) column(`scaledSemiMajorAxis_${L}`, '', aR);
      else {
        column(`starDensity_${L}`, 'g/cm^3', (phi) => {
          const s = P(phi) * SECONDS_PER_DAY;
          return (3 * Math.PI * aR(phi) ** 3) / (GRAVITATIONAL_CONSTANT * s * s) / 1000;
        });
      }
      column(`totalDuration_${L}`, 'h', (phi) => 24 * contactDuration(P(phi), aR(phi), 1 + kr(phi), b(phi), sinI(phi), factor(phi)));
      column(`fullDuration_${L}`, 'h', (phi) =>
        kr(phi) < 1 ? 24 * contactDuration(P(phi), aR(phi), 1 - kr(phi), b(phi), sinI(phi), factor(phi)) : 0,
      );
      if (hasRadius) {
        column(`planetRadius_${L}`, 'R_earth', (phi) => (kr(phi) * starRadius(phi) * SOLAR_RADIUS_M) / EARTH_RADIUS_M);
        column(`planetRadiusJupiter_${L}`, 'R_jup', (phi) => (kr(phi) * starRadius(phi) * SOLAR_RADIUS_M) / JUPITER_RADIUS_M);
      }
      if (inRv && hasMass) {
        column(`planetMass_${L}`, 'M_earth', (phi) => trueMass(phi) / EARTH_MASS_IN_SOLAR);
        column(`planetMassJupiter_${L}`, 'M_jup', (phi) => trueMass(phi) / JUPITER_MASS_IN_SOLAR);
        if (hasRadius) {
          column(`planetDensity_${L}`, 'g/cm^3', (phi) => {
            const r = kr(phi) * starRadius(phi) * SOLAR_RADIUS_M;
            return (trueMass(phi) * SOLAR_MASS_KG) / ((4 / 3) * Math.PI * r * r * r) / 1000;
          });
        }
      }
    }
  }
  if (system.limbDarkening === 'kipping') {
    for (const [b, band] of plan.bands.entries()) {
      const q1 = (phi: Float64Array): number => phi[layout.limbFirst[b]];
      const q2 = (phi: Float64Array): number => phi[layout.limbSecond[b]];
      column(`u1_${band}`, '', (phi) => 2 * Math.sqrt(q1(phi)) * q2(phi));
      column(`u2_${band}`, '', (phi) => Math.sqrt(q1(phi)) * (1 - 2 * q2(phi)));
    }
  }

  const tpColumns = system.planets.map((p) => names.indexOf(`periastronTime_${p.label}`));
  const omegaColumns = system.planets.map((p) => names.indexOf(`omega_${p.label}`));
  return {
    names,
    units,
    write(phi, out) {
      for (let c = 0; c < writers.length; c++) writers[c](phi, out, c);
    },
    anchor(phi) {
      const out = new Float64Array(writers.length);
      tpReference.fill(NaN);
      omegaReference.fill(NaN);
      for (let c = 0; c < writers.length; c++) writers[c](phi, out, c);
      // Only an eccentricity clearly away from 0 gives ω (and tp) a meaningful reference.
      system.planets.forEach((_, i) => {
        const e = phi[layout.eccentricity[i]] ** 2 + phi[layout.eccentricity[i] + 1] ** 2;
        if (!(e >= 0.02)) return;
        if (tpColumns[i] >= 0) tpReference[i] = out[tpColumns[i]];
        if (omegaColumns[i] >= 0) omegaReference[i] = out[omegaColumns[i]];
      });
    },
  };
}

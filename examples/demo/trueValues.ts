/**
 * The true values of the demo in the model's own trace columns: the scenario's
 * parameters as the model samples them (conjunction times moved to the orbit nearest
 * the reference epoch, days since it; eccentricity as (√e cos ω, √e sin ω); limb
 * darkening as Kipping's q1, q2), and every derived quantity computed from them by
 * the model itself.
 */
import type { PlanetSystemModel } from '@apsis/models';
import { densityFromMassRadius, photometer, planets, spectrographs, star } from './scenario.js';

const RAD = Math.PI / 180;

/** The sampled parameters' true values, by trace column. */
export function trueParameters(epoch: number): Record<string, number> {
  const out: Record<string, number> = {};
  for (const p of planets) {
    const n = Math.round((epoch - p.tc) / p.period);
    out[`period_${p.label}`] = p.period;
    out[`tc_${p.label}`] = p.tc + n * p.period - epoch;
    out[`sqrtEcosW_${p.label}`] = Math.sqrt(p.eccentricity) * Math.cos(p.omega * RAD);
    out[`sqrtEsinW_${p.label}`] = Math.sqrt(p.eccentricity) * Math.sin(p.omega * RAD);
    out[`semiAmplitude_${p.label}`] = p.semiAmplitude;
    if (p.transiting) {
      out[`radiusRatio_${p.label}`] = p.radiusRatio as number;
      out[`impactParameter_${p.label}`] = p.impactParameter as number;
    }
  }
  out.starDensity = densityFromMassRadius(star.mass, star.radius);
  out.starMass = star.mass;
  out.starRadius = star.radius;
  for (const s of spectrographs) {
    out[`offset_${s.label}`] = s.offset;
    out[`jitter_${s.label}`] = s.jitter;
  }
  // Kipping (2013): q1 = (u1 + u2)², q2 = u1 / (2 (u1 + u2)).
  const sum = photometer.u1 + photometer.u2;
  out[`q1_${photometer.label}`] = sum * sum;
  out[`q2_${photometer.label}`] = photometer.u1 / (2 * sum);
  out[`baseline_${photometer.label}`] = photometer.baseline;
  out[`fluxJitter_${photometer.label}`] = photometer.jitter;
  return out;
}

/** Every trace column's true value: the parameters, then the derived quantities from them. */
export function trueColumns(model: PlanetSystemModel): Record<string, number> {
  return model.valuesAt(model.positionOf(trueParameters(model.epoch)));
}

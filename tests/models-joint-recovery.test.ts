import { runChains } from '@apsis/core';
import { splitRhat } from '@apsis/diagnostics';
import { createJointModel } from '@apsis/models';
import { describe, expect, it } from 'vitest';
import { simulate, truth } from '../examples/joint-fit.js';

/**
 * Joint recovery (issue 5, long variant; the tutorial test runs the same program
 * briefly on every run): the invented system of examples/joint-fit.ts — a transiting,
 * eccentric planet seen by two spectrographs and a photometer, and a second planet seen
 * in velocities only — with every parameter free. Every true value of the shared orbit,
 * the transit geometry and the derived true mass lies inside its central 99% interval,
 * every split R-hat (Vehtari et al. 2021) is below 1.01 and no transition diverges.
 * Fixed seeds; true masses and densities computed here from Lovis & Fischer (2010, eq. 1)
 * by bisection and from Seager & Mallén-Ornelas (2003).
 */
const ORIGIN = 2460000;
const GM_SUN = 1.3271244e20; // IAU 2015 B3
const GM_EARTH = 3.986004e14;
const G = 6.6743e-11; // CODATA 2018

describe.runIf(process.env.APSIS_FULL === '1')('joint recovery, all parameters free', () => {
  it('recovers the shared orbit, the transit and the true mass', async () => {
    const { rv, lightCurve } = simulate(60, 4, 'joint recovery');
    const model = await createJointModel({
      rv,
      lightCurves: [lightCurve],
      planets: [
        { label: 'b', period: 4.2318, tc: ORIGIN + 1.371 },
        { label: 'c', period: 21.85, tc: ORIGIN + 8.0, transiting: false },
      ],
      star: { mass: truth.star.mass, massUncertainty: 0.04, radius: truth.star.radius, radiusUncertainty: 0.03 },
    });
    const draws = 600;
    const result = await runChains(model, { chains: 4, warmup: 500, draws, seed: 21 });
    expect(result.divergences).toEqual([0, 0, 0, 0]);

    const { b } = truth;
    const w = (b.omega * Math.PI) / 180;
    const n = Math.round((model.epoch - b.tc) / b.period);
    const aR = Math.cbrt((G * truth.star.density * 1000 * (b.period * 86400) ** 2) / (3 * Math.PI));
    const inc = Math.acos((b.impactParameter * (1 + b.eccentricity * Math.sin(w))) / (aR * (1 - b.eccentricity ** 2)));
    const kOf = (m: number): number =>
      (Math.cbrt((2 * Math.PI * GM_SUN) / (b.period * 86400)) * m * Math.sin(inc)) / Math.pow(truth.star.mass + m, 2 / 3) / Math.sqrt(1 - b.eccentricity ** 2);
    let lo = 0;
    let hi = 0.01;
    for (let i = 0; i < 200; i++) (kOf(0.5 * (lo + hi)) < b.semiAmplitude ? (lo = 0.5 * (lo + hi)) : (hi = 0.5 * (lo + hi)));
    const known: Record<string, number> = {
      period_b: b.period,
      tc_b: b.tc + n * b.period - model.epoch,
      sqrtEcosW_b: Math.sqrt(b.eccentricity) * Math.cos(w),
      sqrtEsinW_b: Math.sqrt(b.eccentricity) * Math.sin(w),
      semiAmplitude_b: b.semiAmplitude,
      radiusRatio_b: b.radiusRatio,
      impactParameter_b: b.impactParameter,
      starDensity: truth.star.density,
      semiAmplitude_c: truth.c.semiAmplitude,
      period_c: truth.c.period,
      offset_north: truth.offsets.north,
      offset_south: truth.offsets.south,
      scaledSemiMajorAxis_b: aR,
      inclination_b: (inc * 180) / Math.PI,
      planetMass_b: (0.5 * (lo + hi) * GM_SUN) / GM_EARTH,
    };
    const { names, values } = result.outputs!;
    const missed: string[] = [];
    for (const [c, name] of names.entries()) {
      const chains = values.map((v) => Float64Array.from({ length: draws }, (_, i) => v[i * names.length + c]));
      expect(splitRhat(chains), name).toBeLessThan(1.01);
      if (!(name in known)) continue;
      const sorted = chains.flatMap((x) => Array.from(x)).sort((x, y) => x - y);
      const low = sorted[Math.floor(0.005 * sorted.length)];
      const high = sorted[Math.ceil(0.995 * sorted.length) - 1];
      if (!(low < known[name] && known[name] < high)) missed.push(`${name}: ${known[name]} outside [${low}, ${high}]`);
    }
    expect(missed).toEqual([]);
  }, 900_000);
});

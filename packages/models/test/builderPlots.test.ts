import { createRandomStream } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { createJointModel, fitPanels, simulateLightCurve, simulateRadialVelocities, solveKepler } from '../src/index.js';
import { irregularTimes, lightCurveTruth, rvTruth, starTruth, transitWindows, twoPlanets } from './builderFixtures.js';

/**
 * Fit panels: with the true values as the only draw, the folded data with the other
 * signals removed equal that planet's true signal plus the simulated noise, residuals
 * equal the noise, model curves follow the Keplerian velocity computed here from
 * Kepler's equation (Winn 2010: v = K [cos(f + ω) + e cos ω]), units are stated, and
 * the number of model curves is bounded.
 */
describe('fit panels', async () => {
  const [b, c] = twoPlanets;
  const times = irregularTimes(60, 300, 'plots-times');
  const instrument = times.map((_, i) => (i % 2 ? 'south' : 'north'));
  const sim = simulateRadialVelocities({ times, instrument, errors: 2, planets: twoPlanets, ...rvTruth }, createRandomStream('plots-rv'));
  const lcSim = simulateLightCurve(
    { label: 'cam', times: transitWindows(b, 25, 10 / 1440, 0.2), errors: 6e-4, exposureTime: 10 / 1440, planets: [b], starDensity: starTruth.density, ...lightCurveTruth },
    createRandomStream('plots-lc'),
  );
  const lc = lcSim.data;
  const model = await createJointModel({
    rv: sim.data,
    lightCurves: [lc],
    planets: [
      { label: 'b', period: b.period, tc: b.tc },
      { label: 'c', period: c.period, tc: c.tc, transiting: false },
    ],
    searchMode: false,
  });
  const rad = Math.PI / 180;
  const truth: Record<string, number> = { starDensity: 1.9, q1_cam: (0.42 + 0.22) ** 2, q2_cam: 0.42 / (2 * 0.64), baseline_cam: 1.0003, fluxJitter_cam: 2e-4 };
  for (const [p, label] of [[b, 'b'], [c, 'c']] as const) {
    truth[`period_${label}`] = p.period;
    truth[`tc_${label}`] = p.tc - model.epoch;
    truth[`sqrtEcosW_${label}`] = Math.sqrt(p.eccentricity ?? 0) * Math.cos((p.omega ?? 90) * rad);
    truth[`sqrtEsinW_${label}`] = Math.sqrt(p.eccentricity ?? 0) * Math.sin((p.omega ?? 90) * rad);
    truth[`semiAmplitude_${label}`] = p.semiAmplitude ?? 0;
  }
  truth.radiusRatio_b = b.radiusRatio ?? 0;
  truth.impactParameter_b = b.impactParameter ?? 0;
  for (const [j, v] of Object.entries(rvTruth.offsets)) truth[`offset_${j}`] = v;
  for (const [j, v] of Object.entries(rvTruth.jitters)) truth[`jitter_${j}`] = v;
  const x = model.positionOf(truth);

  /** v = K [cos(f + ω) + e cos ω] from Kepler's equation, for a planet of the fixture. */
  function velocity(p: (typeof twoPlanets)[number], t: number): number {
    const e = p.eccentricity ?? 0;
    const w = (p.omega ?? 90) * rad;
    // Conjunction: f = π/2 − ω; its mean anomaly from E = 2 atan(√((1−e)/(1+e)) tan(f/2)).
    const fc = Math.PI / 2 - w;
    const Ec = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(fc / 2));
    const Mc = Ec - e * Math.sin(Ec);
    const E = solveKepler((2 * Math.PI * (t - p.tc)) / p.period + Mc, e);
    const f = 2 * Math.atan2(Math.sqrt(1 + e) * Math.sin(E / 2), Math.sqrt(1 - e) * Math.cos(E / 2));
    return (p.semiAmplitude ?? 0) * (Math.cos(f + w) + e * Math.cos(w));
  }

  it('fold the radial velocities of each planet with the other signals removed', () => {
    const panels = fitPanels(model, [x]);
    expect(panels.map((p) => p.title)).toEqual([
      'Radial velocities',
      'Radial velocity of planet b, folded',
      'Radial velocity of planet c, folded',
      'Transit of planet b, light curve cam',
    ]);
    const folded = panels[1];
    expect([folded.xUnit, folded.yUnit]).toEqual(['phase', 'm/s']);
    expect(folded.groups.map((g) => g.label)).toEqual(['north', 'south']);
    const values = sim.data.values as Float64Array;
    for (const [j, g] of folded.groups.entries()) {
      const rows = times.flatMap((_, i) => (instrument[i] === ['north', 'south'][j] ? [i] : []));
      rows.forEach((i, q) => {
        const noise = values[i] - sim.noiseless[i];
        expect(g.y[q]).toBeCloseTo(velocity(b, times[i]) + noise, 7); // absolute times here: t − tc loses ~1e-9 d
        expect(folded.residuals![j].y[q]).toBeCloseTo(noise, 7);
        const phase = (times[i] - b.tc) / b.period;
        expect(g.x[q]).toBeCloseTo(phase - Math.floor(phase + 0.5), 9);
        expect(g.yErr![q]).toBeCloseTo(Math.hypot(2, rvTruth.jitters[instrument[i] as 'north' | 'south']), 12);
      });
    }
    const curve = folded.modelDraws![0];
    for (const q of [0, 57, 239]) expect(curve.y[q]).toBeCloseTo(velocity(b, b.tc + curve.x[q] * b.period), 7);
  });

  it('show transits against hours from mid-transit in relative flux, and bound the model draws', () => {
    const s = createRandomStream('plots-draws');
    const many = Array.from({ length: 100 }, () => Float64Array.from({ length: model.dim }, () => 0.3 * s.normal()));
    const panels = fitPanels(model, [...many, x], { maxDraws: 7, curvePoints: 50 });
    const transit = panels[3];
    expect([transit.xLabel, transit.xUnit, transit.yUnit]).toEqual(['time from mid-transit', 'h', 'relative flux']);
    expect(transit.modelDraws).toHaveLength(7);
    expect(transit.modelDraws![0].x).toHaveLength(50);
    for (const p of panels) expect(p.modelDraws!.length).toBeLessThanOrEqual(7);
    // By default the half-width is 1.5 total durations; here the whole ±0.2 d of data.
    const narrow = fitPanels(model, [x])[3];
    expect(Math.max(...Array.from(narrow.groups[0].x, Math.abs))).toBeLessThanOrEqual(1.5 * model.valuesAt(x).totalDuration_b + 1e-9);
    const t = fitPanels(model, [x], { transitWindowHours: 4.8 })[3];
    const depth = 1 - Math.min(...Array.from(t.modelDraws![0].y));
    expect(depth).toBeGreaterThan(0.8 * 0.085 ** 2);
    // Residuals at the true values are the simulated noise over the baseline; the fit
    // integrates exposures with 5 sub-samples, the simulation with 41 (measured: the
    // midpoint rule with 2-minute sub-samples is within 1.1e-5 of it for this transit).
    const flux = lc.flux as Float64Array;
    const lcTimes = lc.times as Float64Array;
    const rows = Array.from(lcTimes.keys()).filter((i) => {
      const d = lcTimes[i] - b.tc - b.period * Math.round((lcTimes[i] - b.tc) / b.period);
      return Math.abs(d) <= 0.2;
    });
    expect(t.residuals![0].y).toHaveLength(rows.length);
    rows.forEach((i, q) => {
      expect(Math.abs(t.residuals![0].y[q] - (flux[i] - lcSim.noiseless[i]) / lightCurveTruth.baseline)).toBeLessThan(3e-5);
      expect(Math.abs(t.groups[0].y[q] - flux[i] / lightCurveTruth.baseline)).toBeLessThan(1e-12);
    });
  });
});

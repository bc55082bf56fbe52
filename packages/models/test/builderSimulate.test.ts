import { createRandomStream } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { quadraticTransitFlux, simulateLightCurve, simulateRadialVelocities } from '../src/index.js';

/**
 * The simulation helpers against independent computations: a circular-orbit radial
 * velocity v = −K sin(2π (t − tc)/P) (the Winn 2010 convention, v = K cos(f + ω) with
 * f + ω = π/2 at conjunction), normal noise of variance error² + jitter² (tolerance 4
 * Monte Carlo standard errors, fixed seed), and exposure smearing as the average of
 * the instantaneous flux over each exposure (Kipping 2010, MNRAS 408, 1758), here by a
 * 2001-point average of the Mandel & Agol (2002) flux on a circular orbit whose sky
 * separation is z = (a/R_*) √(sin² φ + cos² i cos² φ), φ = 2π (t − tc)/P.
 */
describe('simulated radial velocities', () => {
  it('follow the Keplerian model, offsets and trend, with noise of the stated variance', () => {
    const n = 4000;
    const times = Array.from({ length: n }, (_, i) => 100 + 0.37 * i);
    const sim = simulateRadialVelocities(
      {
        times,
        instrument: times.map((_, i) => (i % 2 ? 'a' : 'b')),
        errors: 2,
        planets: [{ period: 5.3, tc: 101.2, semiAmplitude: 17 }],
        offsets: { a: 3, b: -4 },
        jitters: { a: 1.5 },
        trend: { epoch: 500, linear: 0.01 },
      },
      createRandomStream('sim-rv'),
    );
    for (const i of [0, 17, 1234, 3999]) {
      const t = times[i];
      const expected = -17 * Math.sin((2 * Math.PI * (t - 101.2)) / 5.3) + (i % 2 ? 3 : -4) + 0.01 * (t - 500);
      expect(sim.noiseless[i]).toBeCloseTo(expected, 10);
    }
    for (const [parity, sd] of [[1, Math.hypot(2, 1.5)], [0, 2]] as const) {
      const r: number[] = [];
      for (let i = parity; i < n; i += 2) r.push((sim.data.values as Float64Array)[i] - sim.noiseless[i]);
      const m = r.reduce((a, b) => a + b, 0) / r.length;
      const s = Math.sqrt(r.reduce((a, b) => a + (b - m) ** 2, 0) / (r.length - 1));
      expect(Math.abs(m)).toBeLessThan((4 * sd) / Math.sqrt(r.length));
      expect(Math.abs(s - sd)).toBeLessThan((4 * sd) / Math.sqrt(2 * r.length));
    }
    expect(sim.data.instrument[1]).toBe('a');
  });
});

describe('simulated light curves', () => {
  const P = 3.7;
  const tc = 10.25;
  const aR = 9.5;
  const b = 0.3;
  const k = 0.1;
  const [u1, u2] = [0.45, 0.2];
  const cosI = b / aR;
  const instantaneous = (t: number): number => {
    const phi = (2 * Math.PI * (t - tc)) / P;
    if (Math.cos(phi) <= 0) return 1;
    const z = aR * Math.sqrt(Math.sin(phi) ** 2 + cosI * cosI * Math.cos(phi) ** 2);
    return quadraticTransitFlux(z, k, u1, u2);
  };

  it('integrate the flux over each exposure', () => {
    const exposure = 30 / 1440;
    const times = Array.from({ length: 200 }, (_, i) => tc - 0.15 + 0.0015 * i);
    const sim = simulateLightCurve(
      { label: 'x', times, errors: 1e-4, exposureTime: exposure, planets: [{ period: P, tc, scaledSemiMajorAxis: aR, impactParameter: b, radiusRatio: k }], u1, u2 },
      createRandomStream('sim-lc'),
    );
    let worst = 0;
    let rounding = 0;
    for (const [i, t] of times.entries()) {
      let sum = 0;
      const m = 2001;
      for (let j = 0; j < m; j++) sum += instantaneous(t - exposure / 2 + (exposure * (j + 0.5)) / m);
      worst = Math.max(worst, Math.abs(sim.noiseless[i] - sum / m));
      rounding = Math.max(rounding, Math.abs(sim.noiseless[i] - instantaneous(t)));
    }
    expect(worst).toBeLessThan(3e-6);
    // A 30-minute exposure visibly rounds a transit of about 2.5 hours (common practice).
    expect(rounding).toBeGreaterThan(1e-3);
    expect(sim.data.exposureTime).toBe(exposure);
  });

  it('apply baseline, dilution and noise', () => {
    const times = Array.from({ length: 3000 }, (_, i) => tc + 0.6 + 0.0005 * i); // out of transit
    const sim = simulateLightCurve(
      { label: 'x', times, errors: 1e-3, jitter: 5e-4, baseline: 2.5, dilution: 0.3, planets: [{ period: P, tc, scaledSemiMajorAxis: aR, impactParameter: b, radiusRatio: k }], u1, u2 },
      createRandomStream('sim-lc-2'),
    );
    const r = (sim.data.flux as Float64Array).map((f, i) => f - sim.noiseless[i]);
    expect(sim.noiseless[0]).toBeCloseTo(2.5, 12);
    const sd = Math.sqrt(r.reduce((a, x) => a + x * x, 0) / r.length);
    expect(Math.abs(sd - Math.hypot(1e-3, 5e-4))).toBeLessThan((4 * Math.hypot(1e-3, 5e-4)) / Math.sqrt(2 * r.length));
    // In transit the depth is divided by 1 + D.
    const mid = simulateLightCurve({ label: 'x', times: [tc], errors: 1e-9, baseline: 1, dilution: 0.3, planets: [{ period: P, tc, scaledSemiMajorAxis: aR, impactParameter: b, radiusRatio: k }], u1, u2 }, createRandomStream('s'));
    expect(1 - mid.noiseless[0]).toBeCloseTo((1 - instantaneous(tc)) / 1.3, 12);
  });
});

import { createRandomStream, priors, runChains } from '@apsis/core';
import { mcseOfMean, mcseOfSd } from '@apsis/diagnostics';
import { createRvModel, createTransitModel, quadraticTransitFlux, simulateLightCurve, simulateRadialVelocities } from '@apsis/models';
import { describe, expect, it } from 'vitest';

/**
 * Precision (numerics policy of the design notes, point 5): a period posterior far
 * narrower than the float32 spacing of the period (2.4e-7 d at P = 3.2 d) is sampled
 * with the right width. The reference is an independent float64 1-D grid of the exact
 * log-posterior over the period with every other parameter held at its true value —
 * and the models are built with those parameters fixed too (`fixed`), so the two
 * compute the same conditional posterior. The grid uses its own circular-orbit
 * geometry, z = (a/R_*) √(sin² φ + cos² i cos² φ) (Winn 2010, eqs. 2–4 with e = 0),
 * the Mandel & Agol (2002) flux `quadraticTransitFlux`, and for radial velocities
 * v = −K sin(2π (t − tc)/P). Tolerances: 4 Monte Carlo standard errors (fixed seeds).
 */
const ORIGIN = 2460000;
const G = 6.6743e-11; // CODATA 2018

/** Posterior mean and sd on a fine grid of P (trapezoid rule), from a log-density. */
function gridMoments(logDensity: (P: number) => number, centre: number, width: number): { mean: number; sd: number } {
  // Locate the peak and width on a coarse grid over centre ± width, then integrate over
  // ±9 sd on a fine one (the trapezoid rule on a smooth peak: error far below MCSE).
  let peak = centre;
  let best = -Infinity;
  for (let i = -40; i <= 40; i++) {
    const P = centre + (width * i) / 40;
    const v = logDensity(P);
    if (v > best) {
      best = v;
      peak = P;
    }
  }
  const h = width / 400;
  const curvature = (logDensity(peak + h) - 2 * best + logDensity(peak - h)) / (h * h);
  const sigma = 1 / Math.sqrt(-curvature);
  const n = 241;
  const xs: number[] = [];
  const ws: number[] = [];
  for (let i = 0; i < n; i++) {
    const x = -9 * sigma + (18 * sigma * i) / (n - 1);
    xs.push(x);
    ws.push(logDensity(peak + x));
  }
  const top = Math.max(...ws);
  let z = 0;
  let m1 = 0;
  let m2 = 0;
  for (let i = 0; i < n; i++) {
    const w = Math.exp(ws[i] - top) * (i === 0 || i === n - 1 ? 0.5 : 1);
    z += w;
    m1 += w * xs[i];
    m2 += w * xs[i] * xs[i];
  }
  const mean = m1 / z;
  return { mean: peak + mean, sd: Math.sqrt(m2 / z - mean * mean) };
}

/** The float32 spacing of x (distance to the next float32 above). */
function float32Spacing(x: number): number {
  const f = new Float32Array([x]);
  const i = new Int32Array(f.buffer);
  i[0] += 1;
  return f[0] - Math.fround(x);
}

function column(result: Awaited<ReturnType<typeof runChains>>, name: string): Float64Array[] {
  const { names, values } = result.outputs!;
  const c = names.indexOf(name);
  return values.map((v) => {
    const n = v.length / names.length;
    const out = new Float64Array(n);
    for (let i = 0; i < n; i++) out[i] = v[i * names.length + c];
    return out;
  });
}

function quantile(chains: Float64Array[], p: number): number {
  const all = chains.flatMap((c) => Array.from(c)).sort((a, b) => a - b);
  return all[Math.min(all.length - 1, Math.floor(p * all.length))];
}

function checkAgainstGrid(chains: Float64Array[], grid: { mean: number; sd: number }, truth: number): void {
  const all = chains.flatMap((c) => Array.from(c));
  const mean = all.reduce((a, b) => a + b, 0) / all.length;
  const sd = Math.sqrt(all.reduce((a, b) => a + (b - mean) ** 2, 0) / (all.length - 1));
  if (process.env.APSIS_PRINT === '1') console.log(JSON.stringify({ grid, mean, sd, mcseSd: mcseOfSd(chains), mcseMean: mcseOfMean(chains) }));
  expect(Math.abs(sd - grid.sd)).toBeLessThan(4 * mcseOfSd(chains));
  expect(Math.abs(mean - grid.mean)).toBeLessThan(4 * mcseOfMean(chains));
  expect(quantile(chains, 0.005)).toBeLessThan(truth);
  expect(quantile(chains, 0.995)).toBeGreaterThan(truth);
}

describe('period posteriors narrower than float32 spacing', () => {
  async function transitCase(span: number, chains: number, warmup: number, draws: number): Promise<void> {
    const P = 3.2;
    const tc = ORIGIN + 0.61;
    const k = 0.12;
    const b = 0.3;
    const density = 1.4; // g/cm³
    const [u1, u2] = [0.4, 0.25];
    const cadence = 10 / 1440;
    const times: number[] = [];
    for (let t = ORIGIN; t < ORIGIN + span; t += cadence) {
      const d = t - tc - P * Math.round((t - tc) / P);
      if (Math.abs(d) < 0.065) times.push(t); // the transit lasts 0.12 d
    }
    const errors = 1e-4;
    const planet = { period: P, tc, radiusRatio: k, impactParameter: b };
    const sim = simulateLightCurve({ label: 'cam', times, errors, planets: [planet], starDensity: density, u1, u2 }, createRandomStream('precision-transit'));
    const q1 = (u1 + u2) ** 2;
    const q2 = u1 / (2 * (u1 + u2));
    const periodPrior = priors.normal(3.2, 1e-3);
    const model = await createTransitModel({
      lightCurves: [sim.data],
      planets: [{ label: 'b', period: P, tc }],
      priors: { period_b: periodPrior },
      fixed: { tc_b: tc - (ORIGIN + span / 2), radiusRatio_b: k, impactParameter_b: b, starDensity: density, q1_cam: q1, q2_cam: q2, baseline_cam: 1, fluxJitter_cam: 0 },
      referenceEpoch: ORIGIN + span / 2,
    });
    expect(model.dim).toBe(1);

    // Independent log-posterior over P (others at the truth, as in the model).
    const t = Float64Array.from(times, (x) => x - ORIGIN);
    const y = sim.data.flux as Float64Array;
    const tcRel = tc - ORIGIN;
    const logPosterior = (period: number): number => {
      const s = period * 86400;
      const aR = Math.cbrt((G * density * 1000 * s * s) / (3 * Math.PI)); // Seager & Mallén-Ornelas 2003
      const cosI = b / aR;
      let chi2 = 0;
      for (let i = 0; i < t.length; i++) {
        const phi = (2 * Math.PI * (t[i] - tcRel)) / period;
        const z = aR * Math.sqrt(Math.sin(phi) ** 2 + cosI * cosI * Math.cos(phi) ** 2);
        const f = Math.cos(phi) > 0 && z < 1 + k ? quadraticTransitFlux(z, k, u1, u2) : 1;
        chi2 += ((y[i] - f) / errors) ** 2;
      }
      return -0.5 * chi2 + periodPrior.logDensity(period);
    };
    const grid = gridMoments(logPosterior, P, 1e-6);
    expect(grid.sd).toBeLessThan(float32Spacing(P)); // the premise: narrower than float32 spacing
    expect(grid.sd).toBeLessThan(1e-6);

    const result = await runChains(model, { chains, warmup, draws, seed: 11 });
    expect(result.divergences).toEqual(new Array(chains).fill(0));
    checkAgainstGrid(column(result, 'period_b'), grid, P);
  }

  it('a transiting planet over 440 days (10-minute cadence): sd from NUTS equals the float64 grid', () => transitCase(440, 2, 150, 400));
  it.runIf(process.env.APSIS_FULL === '1')('a transiting planet over two years, four chains', () => transitCase(730, 4, 300, 600));

  it('radial velocities of a hot Jupiter over ten years: sd from NUTS equals the float64 grid', async () => {
    const P = 3.2;
    const tc = ORIGIN + 1.1;
    const K = 300;
    const n = 500;
    const stream = createRandomStream('precision-rv-times');
    const times = Array.from({ length: n }, () => ORIGIN + 3650 * stream.uniform());
    const sim = simulateRadialVelocities(
      { times, instrument: 'spec', errors: 0.5, planets: [{ period: P, tc, semiAmplitude: K }], offsets: { spec: 7 } },
      createRandomStream('precision-rv'),
    );
    const epoch = ORIGIN + 1825;
    const tcMiddle = tc + 570 * P; // the conjunction nearest the epoch, held fixed in both
    const periodPrior = priors.normal(3.2, 1e-3);
    const model = await createRvModel({
      rv: sim.data,
      planets: [{ label: 'b', period: P, tc, eccentric: false }],
      priors: { period_b: periodPrior },
      fixed: { tc_b: tcMiddle - epoch, semiAmplitude_b: K, offset_spec: 7, jitter_spec: 0 },
      referenceEpoch: epoch,
    });
    expect(model.dim).toBe(1);
    const t = Float64Array.from(times, (x) => x - ORIGIN);
    const v = sim.data.values as Float64Array;
    const logPosterior = (period: number): number => {
      let chi2 = 0;
      for (let i = 0; i < n; i++) {
        const m = 7 - K * Math.sin((2 * Math.PI * (t[i] - (tcMiddle - ORIGIN))) / period);
        chi2 += ((v[i] - m) / 0.5) ** 2;
      }
      return -0.5 * chi2 + periodPrior.logDensity(period);
    };
    const grid = gridMoments(logPosterior, P, 1e-6);
    expect(grid.sd).toBeLessThan(float32Spacing(P));
    const result = await runChains(model, { chains: 4, warmup: 200, draws: 500, seed: 12 });
    expect(result.divergences).toEqual([0, 0, 0, 0]);
    checkAgainstGrid(column(result, 'period_b'), grid, P);
  });
});

import { createRandomStream, runChains } from '@apsis/core';
import { mcseOfQuantile, splitRhat } from '@apsis/diagnostics';
import { createRvModel, simulateRadialVelocities } from '@apsis/models';
import { describe, expect, it } from 'vitest';

/**
 * Recovery (issue 4): radial velocities of an invented star with two eccentric planets,
 * seen by two spectrographs with different offsets and jitters, simulated from known
 * true values. Every true value — sampled parameters and derived quantities — lies
 * inside its central 99% posterior interval (within 3 MCSE of its ends), every split
 * R-hat (rank-normalised, Vehtari et al. 2021) is below 1.01, and no transition
 * diverges. Fixed seeds; with about 25 strongly correlated columns the chance of one
 * miss for a correct sampler is a few per cent (binomial, common practice).
 *
 * Derived truths are computed here: minimum masses by bisection on Lovis & Fischer
 * (2010, eq. 1), the semi-major axis by Kepler's third law, the time of periastron from
 * the mean anomaly at conjunction (f = π/2 − ω, Winn 2010).
 */
const ORIGIN = 2460000;
const GM_SUN = 1.3271244e20; // IAU 2015 B3
const GM_EARTH = 3.986004e14;
const AU = 149597870700;
const truth = {
  planets: [
    { label: 'b', period: 4.2317, tc: ORIGIN + 1.37, eccentricity: 0.12, omega: 65, semiAmplitude: 28 },
    { label: 'c', period: 21.9, tc: ORIGIN + 8.4, eccentricity: 0.28, omega: -120, semiAmplitude: 11 },
  ],
  offsets: { north: -12.5, south: 31.0 },
  jitters: { north: 1.8, south: 3.2 },
  starMass: 0.92,
};

function minimumMass(K: number, P: number, e: number, M: number): number {
  const k = (m: number): number => (Math.cbrt((2 * Math.PI * GM_SUN) / (P * 86400)) * m) / Math.pow(M + m, 2 / 3) / Math.sqrt(1 - e * e);
  let lo = 0;
  let hi = 1;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (k(mid) < K) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

function trueColumns(epoch: number): Record<string, number> {
  const out: Record<string, number> = { starMass: truth.starMass };
  for (const p of truth.planets) {
    const w = (p.omega * Math.PI) / 180;
    const n = Math.round((epoch - p.tc) / p.period);
    const tc = p.tc + n * p.period - epoch;
    const e = p.eccentricity;
    const fc = Math.PI / 2 - w;
    const Ec = 2 * Math.atan(Math.sqrt((1 - e) / (1 + e)) * Math.tan(fc / 2));
    const Mc = Ec - e * Math.sin(Ec);
    const m = minimumMass(p.semiAmplitude, p.period, e, truth.starMass);
    Object.assign(out, {
      [`period_${p.label}`]: p.period,
      [`tc_${p.label}`]: tc,
      [`sqrtEcosW_${p.label}`]: Math.sqrt(e) * Math.cos(w),
      [`sqrtEsinW_${p.label}`]: Math.sqrt(e) * Math.sin(w),
      [`semiAmplitude_${p.label}`]: p.semiAmplitude,
      [`eccentricity_${p.label}`]: e,
      [`omega_${p.label}`]: p.omega,
      [`periastronTime_${p.label}`]: tc - (p.period * Mc) / (2 * Math.PI),
      [`minimumMass_${p.label}`]: (m * GM_SUN) / GM_EARTH,
      [`semiMajorAxis_${p.label}`]: Math.cbrt((GM_SUN * (truth.starMass + m) * (p.period * 86400) ** 2) / (4 * Math.PI ** 2)) / AU,
    });
  }
  for (const [j, v] of Object.entries(truth.offsets)) out[`offset_${j}`] = v;
  for (const [j, v] of Object.entries(truth.jitters)) out[`jitter_${j}`] = v;
  return out;
}

async function recover(points: number, span: number, chains: number, warmup: number, draws: number, seed: string): Promise<void> {
  const stream = createRandomStream(`${seed}-times`);
  const times = Array.from({ length: points }, () => ORIGIN + span * stream.uniform()).sort((a, b) => a - b);
  const instrument = times.map((_, i) => (i % 3 === 2 ? 'south' : 'north'));
  const errors = instrument.map((j) => (j === 'north' ? 1.5 : 2.5));
  const sim = simulateRadialVelocities({ times, instrument, errors, planets: truth.planets, offsets: truth.offsets, jitters: truth.jitters }, createRandomStream(seed));
  const model = await createRvModel({
    rv: sim.data,
    // Periods as a periodogram would give them, slightly off.
    planets: [
      { label: 'b', period: 4.232 },
      { label: 'c', period: 21.85 },
    ],
    star: { mass: 0.92, massUncertainty: 0.04 },
  });
  const result = await runChains(model, { chains, warmup, draws, seed: 5 });
  expect(result.divergences).toEqual(new Array(chains).fill(0));
  const { names, values } = result.outputs!;
  const known = trueColumns(model.epoch);
  const missed: string[] = [];
  for (const [c, name] of names.entries()) {
    const perChain = values.map((v) => Float64Array.from({ length: draws }, (_, i) => v[i * names.length + c]));
    const rhat = splitRhat(perChain);
    expect(rhat, name).toBeLessThan(1.01);
    if (!(name in known)) continue;
    const sorted = perChain.flatMap((v) => Array.from(v)).sort((a, b) => a - b);
    const lo = sorted[Math.floor(0.005 * sorted.length)];
    const hi = sorted[Math.ceil(0.995 * sorted.length) - 1];
    let t = known[name];
    if (name.startsWith('periastronTime_')) {
      // Periastron passages repeat every period: compare the passage nearest the median.
      const P = known[name.replace('periastronTime_', 'period_')];
      const median = sorted[Math.floor(sorted.length / 2)];
      t += P * Math.round((median - t) / P);
    }
    if (name.startsWith('omega_')) t += 360 * Math.round((sorted[Math.floor(sorted.length / 2)] - t) / 360);
    // The interval's ends are estimates: a truth within 3 MCSE of an end (mcseOfQuantile,
    // Vehtari et al. 2021) cannot be told from one on it. Seen here: the true period of b
    // lies at the posterior's 0.56% quantile (4 × 10 000 draws), and a 4 × 1000 run put
    // the 0.5% end 0.5 MCSE above it.
    const slackLo = 3 * mcseOfQuantile(perChain, 0.005);
    const slackHi = 3 * mcseOfQuantile(perChain, 0.995);
    if (!(lo - slackLo < t && t < hi + slackHi)) missed.push(`${name}: ${t} outside [${lo}, ${hi}] by more than 3 MCSE`);
  }
  expect(Object.keys(known).every((n) => names.includes(n))).toBe(true);
  expect(missed).toEqual([]);
}

describe('radial-velocity recovery, two planets and two spectrographs', () => {
  it('80 points over 400 days, 4 chains of 400 draws', () => recover(80, 400, 4, 400, 400, 'rv-recovery'), 120_000);
  it.runIf(process.env.APSIS_FULL === '1')('200 points over 800 days, 4 chains of 1000 draws', () => recover(200, 800, 4, 1000, 1000, 'rv-recovery-full'), 600_000);
});

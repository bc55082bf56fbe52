/**
 * The demo (`pnpm demo`, examples/demo.ts) at small settings: it runs end to end,
 * prints the backend, the parameter table with the derived quantities and the verdict,
 * streams a run folder that reads back, and writes a report with every kind of plot.
 * Also checked against outside formulas: the true derived quantities the demo prints
 * beside the posterior, and the claim that the photometer's 30-minute exposures
 * matter.
 */
import { mkdtempSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { readRun } from '@apsis/core';
import { createLightCurveKernel } from '@apsis/models';
import { DEMO_RUN_LABEL, DemoOptionsError, main, type DemoResult } from '../examples/demo.js';
import { buildDemoModel } from '../examples/demo/demoModel.js';
import { reportColumns } from '../examples/demo/demoReport.js';
import { densityFromMassRadius, photometer, planets, star } from '../examples/demo/scenario.js';
import { simulateObservations } from '../examples/demo/simulateObservations.js';
import { trueColumns } from '../examples/demo/trueValues.js';

// Constants: G (CODATA 2018), GM_sun and R_sun, R_earth, GM_earth (IAU 2015 Resolution B3).
const G = 6.6743e-11;
const GM_SUN = 1.3271244e20;
const R_SUN = 6.957e8;
const R_EARTH = 6.3781e6;
const GM_EARTH = 3.986004e14;
const DAY = 86400;
const RAD = Math.PI / 180;

describe('demo at small settings', () => {
  let dir = '';
  let result: DemoResult;

  beforeAll(async () => {
    dir = mkdtempSync(path.join(tmpdir(), 'apsis-demo-smoke-'));
    result = await main({ chains: 2, warmup: 100, draws: 60, quiet: true, outDir: path.join(dir, 'report'), runDir: path.join(dir, 'run') });
  }, 120_000);
  afterAll(() => {
    if (dir) rmSync(dir, { recursive: true, force: true });
  });

  it('prints the backend, the sampler set-up, the table with derived quantities and the verdict', () => {
    const text = result.text;
    expect(text).toContain('computation: fused float64 JavaScript kernels');
    expect(text).toMatch(/sampler: NUTS, dense metric, 2 chains × \(100 warmup \+ 60 draws\)/);
    // Every derived quantity the issue asks for, with a finite median on its row.
    for (const [label, unit] of [
      ['planet mass', 'M_earth'],
      ['planet mass', 'M_jup'],
      ['planet radius', 'R_earth'],
      ['planet radius', 'R_jup'],
      ['inclination', 'deg'],
      ['a/R*', ''],
      ['transit duration T14', 'h'],
      ['mean stellar density', 'g/cm^3'],
    ] as const) {
      const row = result.table.split('\n').find((l) => l.startsWith(`  ${label} `) && (unit === '' || l.includes(` ${unit} `)));
      expect(row, `${label} [${unit}]`).toBeDefined();
      const numbers = row!.slice(label.length + 2).match(/-?\d+\.\d+/g) ?? [];
      expect(numbers.length, row).toBeGreaterThanOrEqual(2); // median and true value at least
      expect(Number.isFinite(Number(numbers[0]))).toBe(true);
    }
    expect(text).toMatch(/Verdict: (no check found a problem|NOT converged)/);
    expect(text).toContain('Diagnostics can show a problem but cannot prove convergence');
    expect(text).toContain(`report: `);
  });

  it('streams a run folder that reads back with every draw', () => {
    const run = readRun(result.runFolder!);
    expect(run.manifest.label).toBe(DEMO_RUN_LABEL);
    expect(run.drawsPerChain).toEqual([60, 60]);
    expect(run.outcome?.stop.reason).toBe('completed');
    // The draws read back are the draws the demo summarised, bit for bit.
    expect(run.outputs!.values[1]).toEqual(result.run.outputs!.values[1]);
  });

  it('writes a report with trace, rank, pair and four fit plots', async () => {
    const html = readFileSync(result.reportPath, 'utf8');
    const count = (kind: string): number => html.split(`data-plot="${kind}"`).length - 1;
    const model = await buildDemoModel(null);
    const shown = reportColumns(model).length;
    expect(shown).toBeGreaterThan(model.dim); // sampled parameters and derived quantities
    expect(count('trace')).toBe(shown);
    expect(count('rank')).toBe(shown);
    expect(count('pair')).toBe(1);
    expect(count('fit')).toBe(4); // velocities against time, folded on b and on c, the transit of b
    expect(html).toContain('Transit of planet b');
    expect(html).toContain('Radial velocity of planet c, folded');
  });

  it('rejects bad options naming the option, and leaves a foreign folder alone', async () => {
    await expect(main({ chains: 0 })).rejects.toThrow(/option `chains` = 0: expected an integer from 1 to 64/);
    await expect(main({ colour: 'red' } as never)).rejects.toBeInstanceOf(DemoOptionsError);
    const foreign = path.join(dir, 'foreign');
    mkdirSync(foreign);
    writeFileSync(path.join(foreign, 'notes.txt'), 'keep me');
    await expect(main({ quiet: true, runDir: foreign, outDir: path.join(dir, 'x') })).rejects.toThrow(/runDir/);
    expect(readFileSync(path.join(foreign, 'notes.txt'), 'utf8')).toBe('keep me');
  });
});

describe('the demo scenario against outside formulas', () => {
  it('the true derived quantities printed beside the posterior follow the published formulas', async () => {
    const model = await buildDemoModel(null);
    const truth = trueColumns(model);
    const b = planets[0];
    const e = b.eccentricity;
    const w = b.omega * RAD;
    const P = b.period * DAY;
    const rho = densityFromMassRadius(star.mass, star.radius) * 1000; // kg/m³
    // a/R* = (G ρ P²/(3π))^(1/3): Seager & Mallén-Ornelas (2003), planet mass neglected.
    const aR = Math.cbrt((G * rho * P * P) / (3 * Math.PI));
    expect(truth.scaledSemiMajorAxis_b).toBeCloseTo(aR, 9);
    // b = (a/R*) cos i (1 − e²)/(1 + e sin ω): Winn (2010), eq. 7.
    const bImpact = b.impactParameter as number;
    const cosI = (bImpact * (1 + e * Math.sin(w))) / (aR * (1 - e * e));
    expect(truth.inclination_b).toBeCloseTo(Math.acos(cosI) / RAD, 9);
    // T14 = (P/π) asin[√((1 + k)² − b²)/((a/R*) sin i)] √(1 − e²)/(1 + e sin ω): Winn (2010), eqs. 14, 16.
    const k = b.radiusRatio as number;
    const sinI = Math.sqrt(1 - cosI * cosI);
    const t14 = (b.period / Math.PI) * Math.asin(Math.sqrt((1 + k) ** 2 - bImpact ** 2) / (aR * sinI)) * (Math.sqrt(1 - e * e) / (1 + e * Math.sin(w)));
    expect(truth.totalDuration_b).toBeCloseTo(24 * t14, 9);
    // K = (2πG/P)^(1/3) m sin i/(M* + m)^(2/3)/√(1 − e²): Lovis & Fischer (2010), eq. 1. The
    // true planet mass the demo prints must give back the simulated K.
    const m = (truth.planetMass_b * GM_EARTH) / G;
    const M = (star.mass * GM_SUN) / G;
    const K = (Math.cbrt((2 * Math.PI * G) / P) * m * sinI) / Math.pow(M + m, 2 / 3) / Math.sqrt(1 - e * e);
    expect(K).toBeCloseTo(b.semiAmplitude, 6);
    // R_p = k R*.
    expect(truth.planetRadius_b).toBeCloseTo((k * star.radius * R_SUN) / R_EARTH, 9);
  });

  it('30-minute exposures change the transit by more than the noise can hide (why the model averages over them)', () => {
    // Kipping (2010, MNRAS 408, 1758); "a 30-minute exposure visibly rounds a 2-hour
    // transit" is common practice. Compared here, at the light curve's own times: the
    // exposure-averaged and the instantaneous model of the true transit. Their difference
    // in units of the noise, summed in quadrature, must exceed 9 (3 sigma): a model that
    // ignored the exposures would be detectably wrong for these data.
    const g = trueGeometry();
    const times = Float64Array.from(simulateObservations().lightCurve.times, (t) => t - planets[0].tc);
    const slots = Float64Array.of(g.P, 0, g.e, g.w, g.aR, g.b, g.k, photometer.u1, photometer.u2);
    const instant = createLightCurveKernel({ times, planets: 1 }).flux(slots, new Float64Array(times.length));
    const averaged = createLightCurveKernel({ times, planets: 1, exposureTime: photometer.exposureTime, subSamples: 41 }).flux(slots, new Float64Array(times.length));
    const sigma = Math.hypot(photometer.error, photometer.jitter);
    let chi2 = 0;
    for (let i = 0; i < times.length; i++) chi2 += ((instant[i] - averaged[i]) / sigma) ** 2;
    expect(chi2).toBeGreaterThan(9);
  });
});

/** The true transit geometry of planet b, from the scenario alone. */
function trueGeometry(): { P: number; e: number; w: number; aR: number; b: number; k: number } {
  const b = planets[0];
  const rho = densityFromMassRadius(star.mass, star.radius) * 1000;
  const P = b.period * DAY;
  return {
    P: b.period,
    e: b.eccentricity,
    w: b.omega * RAD,
    aR: Math.cbrt((G * rho * P * P) / (3 * Math.PI)),
    b: b.impactParameter as number,
    k: b.radiusRatio as number,
  };
}

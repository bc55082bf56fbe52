import { priors } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { createJointModel, type JointModelInput, type PlanetSystemModel } from '../src/index.js';
import { lightCurve, rvData, transitWindows, twoPlanets } from './builderFixtures.js';

/**
 * The conjunction time is sampled at the conjunction nearest the middle of the data that
 * time it (T = tc + c P), while the trace keeps tc, the conjunction nearest the epoch.
 * Checks: (1) T and P are nearly uncorrelated where tc and P are not: the intercept of a
 * weighted straight-line fit is uncorrelated with the slope at the weighted mean of the
 * abscissae (common practice; least squares); (2) a prior given for tc holds exactly.
 */

/** Radial velocities over 400 days and transits only in the first 30: the epoch lies ~45 periods from the transits. */
async function farEpochModel(extra: { priors?: JointModelInput['priors'] } = {}, narrow = false): Promise<PlanetSystemModel> {
  const [b, c] = twoPlanets;
  // `narrow`: a default prior on T about as narrow as the posterior, so that its terms
  // in the gradient are as large as the likelihood's.
  const uncertainties = narrow ? { tcUncertainty: 0.002, periodUncertainty: 1e-4 } : {};
  return createJointModel({
    rv: rvData(40, 'conj-rv'),
    lightCurves: [lightCurve('wide', [b], transitWindows(b, 30, 10 / 1440, 0.15), 'conj-lc')],
    planets: [
      { label: 'b', period: b.period, tc: b.tc, ...uncertainties },
      { label: 'c', period: c.period, tc: c.tc, transiting: false },
    ],
    ...extra,
  });
}

/** The 2×2 covariance of coordinates i, j from the inverse of the log-density's Hessian block at x (central differences of the exact gradient). */
function blockCovariance(model: PlanetSystemModel, x: Float64Array, i: number, j: number): [number, number, number] {
  const g = new Float64Array(model.dim);
  const h = 1e-4;
  const column = (k: number): [number, number] => {
    const up = Float64Array.from(x);
    const down = Float64Array.from(x);
    up[k] += h;
    down[k] -= h;
    model.logDensityGrad(up, g);
    const [gi, gj] = [g[i], g[j]];
    model.logDensityGrad(down, g);
    return [-(gi - g[i]) / (2 * h), -(gj - g[j]) / (2 * h)];
  };
  const [a, b1] = column(i);
  const [b2, d] = column(j);
  const b = 0.5 * (b1 + b2);
  const det = a * d - b * b;
  return [d / det, -b / det, a / det];
}

describe('conjunction time sampled near the middle of the transits', () => {
  it('samples T = tc + c P with |corr(T, P)| < 0.3, while |corr(tc, P)| > 0.9; the trace keeps tc', async () => {
    const model = await farEpochModel();
    expect(model.names).toContain('conjunctionNearData_b.u');
    const period = twoPlanets[0].period;
    const x0 = new Float64Array(model.dim);
    const centre = model.valuesAt(x0);
    // tc_b is the conjunction nearest the epoch, as before.
    expect(Math.abs(centre.tc_b)).toBeLessThanOrEqual(period / 2 + 1e-9);
    const cycles = Math.round((twoPlanets[0].tc - model.epoch - centre.tc_b) / period);
    expect(Math.abs(cycles)).toBeGreaterThan(30);

    const iP = model.names.indexOf('period_b.u');
    const iT = model.names.indexOf('conjunctionNearData_b.u');
    const [vP, cPT, vT] = blockCovariance(model, x0, iP, iT);
    const corrT = cPT / Math.sqrt(vP * vT);
    expect(Math.abs(corrT)).toBeLessThan(0.3);
    // tc = T − c P in the same coordinates: scale the period coordinate to days first.
    const step = 1e-3;
    const up = Float64Array.from(x0);
    up[iP] += step;
    const dPdu = (model.valuesAt(up).period_b - centre.period_b) / step;
    up[iP] = 0;
    up[iT] += step;
    const dTdu = (model.valuesAt(up).tc_b - centre.tc_b) / step;
    const varP = vP * dPdu * dPdu;
    const varT = vT * dTdu * dTdu;
    const covPT = cPT * dPdu * dTdu;
    const covPtc = covPT - cycles * varP;
    const varTc = varT - 2 * cycles * covPT + cycles * cycles * varP;
    expect(Math.abs(covPtc / Math.sqrt(varP * varTc))).toBeGreaterThan(0.9);
  });

  it('a normal prior given for tc holds exactly: log p changes by Δ ln p(tc) when only tc moves', async () => {
    const model = await farEpochModel({ priors: { tc_b: priors.normal(-0.2, 0.05) } });
    expect(model.names).toContain('conjunctionNearData_b.u');
    const rest = (x: Float64Array): number => {
      const parts = model.logDensityParts(x);
      const data = model.structure.likelihood.evaluate(model.physicalAt(x), null);
      return parts.total - parts.logJacobian - data;
    };
    const base = model.valuesAt(new Float64Array(model.dim));
    const a = model.positionOf({ tc_b: base.tc_b });
    const b = model.positionOf({ tc_b: base.tc_b + 0.003 });
    const user = priors.normal(-0.2, 0.05);
    const expected = user.logDensity(base.tc_b + 0.003) - user.logDensity(base.tc_b);
    expect(rest(b) - rest(a)).toBeCloseTo(expected, 9);
  });

  it('with a prior given for tc, the gradient equals central differences (standard calculus; step 1e-4: truncation about 1e-8, rounding about 1e-7)', async () => {
    const model = await farEpochModel({ priors: { tc_b: priors.normal(-0.2, 0.05) } }, true);
    expect(model.names).toContain('conjunctionNearData_b.u');
    const g = new Float64Array(model.dim);
    const scratch = new Float64Array(model.dim);
    for (const x of [new Float64Array(model.dim), Float64Array.from({ length: model.dim }, (_, i) => 0.3 * Math.sin(1.7 * i + 0.4))]) {
      expect(Number.isFinite(model.logDensityGrad(x, g))).toBe(true);
      for (let i = 0; i < model.dim; i++) {
        const up = Float64Array.from(x);
        const down = Float64Array.from(x);
        up[i] += 1e-4;
        down[i] -= 1e-4;
        const numeric = (model.logDensityGrad(up, scratch) - model.logDensityGrad(down, scratch)) / 2e-4;
        expect(Math.abs(g[i] - numeric), model.names[i]).toBeLessThan(1e-6 * (1 + Math.abs(numeric)));
      }
    }
  });

  it('a bounded prior given for tc samples tc itself', async () => {
    const model = await farEpochModel({ priors: { tc_b: { uniform: [-2, 2] } } });
    expect(model.names).toContain('tc_b.u');
    expect(model.names).not.toContain('conjunctionNearData_b.u');
  });
});

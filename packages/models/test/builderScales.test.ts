import { describe, expect, it } from 'vitest';
import { createTransitModel } from '../src/index.js';
import { lightCurve, transitWindows, twoPlanets } from './builderFixtures.js';

/**
 * The builders' coordinate scales: one unit of each sampler coordinate is the
 * conditional posterior sd at the centre, 1/√(−∂² log p/∂u²) (the contract stated in
 * planetModel.ts). Checked where it matters most, on a parameter known to a tiny
 * fraction of itself: a light curve's baseline flux, on a log coordinate. Its
 * conditional sd is about σ/√N relative (standard least squares: the flux is baseline ×
 * a model near 1), here 3e-6, far below the 1e-4 log units the scales of one-sided
 * coordinates were once floored at; with that floor the curvature was about 1000.
 */
describe('builder coordinate scales', () => {
  it('give a narrow positive parameter (the baseline flux) unit curvature at the centre', async () => {
    const [b] = twoPlanets;
    const errors = 1e-4;
    const lc = lightCurve('wide', [b], transitWindows(b, 40, 2 / 1440, 0.3), 'scales-lc', { errors, exposureTime: 2 / 1440 });
    const model = await createTransitModel({
      lightCurves: [lc],
      planets: [{ label: 'b', period: b.period, tc: b.tc }],
    });
    const i = model.names.indexOf('baseline_wide.u');
    expect(i).toBeGreaterThanOrEqual(0);
    const x = new Float64Array(model.dim);
    const g = new Float64Array(model.dim);
    const curvature = (h: number): number => {
      x[i] = h;
      model.logDensityGrad(x, g);
      const up = g[i];
      x[i] = -h;
      model.logDensityGrad(x, g);
      const down = g[i];
      x[i] = 0;
      return -(up - down) / (2 * h);
    };
    expect(curvature(0.1)).toBeGreaterThan(0.8);
    expect(curvature(0.1)).toBeLessThan(1.25);
    // One unit of u moves the baseline by its relative sd, about σ/√N.
    const at = (u: number): number => {
      const y = new Float64Array(model.dim);
      y[i] = u;
      return model.valuesAt(y).baseline_wide;
    };
    const relativeStep = Math.log(at(1) / at(0));
    const n = lc.times.length;
    expect(relativeStep).toBeGreaterThan(0.5 * (errors / Math.sqrt(n)));
    expect(relativeStep).toBeLessThan(3 * (errors / Math.sqrt(n)));
    expect(relativeStep).toBeLessThan(1e-5);
  });
});

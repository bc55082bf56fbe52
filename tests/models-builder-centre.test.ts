/**
 * The builders centre every sampler coordinate at the posterior mode (the contract of
 * packages/models/src/builders/planetModel.ts and docs/fitting-radial-velocities.md),
 * checked on the demo's joint model, where a search in the prior widths' units alone
 * stops at its iteration limit: at the centre the log-density's gradient vanishes
 * (first-order condition of a maximum, standard calculus) and an independent search
 * from there finds no higher point. The scale is then one conditional posterior sd,
 * so a gradient of 1e-3 in these units is a thousandth of a standard deviation's pull.
 */
import { findMode } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { buildDemoModel } from '../examples/demo/demoModel.js';

describe('builder centre', () => {
  it("is the mode of the demo's joint model", async () => {
    const model = await buildDemoModel();
    const x = new Float64Array(model.dim);
    const g = new Float64Array(model.dim);
    const lp = model.logDensityGrad(x, g);
    const worst = g.reduce((m, v, i) => (Math.abs(v) > Math.abs(g[m]) ? i : m), 0);
    expect(Math.abs(g[worst]), model.names[worst]).toBeLessThan(1e-3);
    const search = findMode(model, { init: x, maxIterations: 2000 });
    expect(search.logDensity - lp).toBeLessThan(1e-6);
  });
});

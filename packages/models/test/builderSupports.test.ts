import { priors, supports } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { centredSupport } from '../src/builders/supports/centred.js';
import { eccentricityDiskPrior } from '../src/builders/eccentricityPrior.js';
import { IMPACT_STRETCH, impactFractionSupport } from '../src/builders/supports/impactFraction.js';

/**
 * The builders' centred, scaled support wrapper and the eccentricity prior on the unit
 * disk (`supports.unitDisk` of the modelling layer, tested with the other bijections).
 * Checks: the chain rule against central differences, round trips, normalisation and
 * marginals by quadrature (change of variables, standard calculus).
 */

describe('centred support', () => {
  it('maps u to the base at centre + scale·u, adds ln scale, and chains gradients', () => {
    const base = supports.interval(-2, 5);
    const s = centredSupport(base, [0.7], [0.03]).bind(1);
    const b = base.bind(1);
    const u = Float64Array.of(1.3);
    const theta = new Float64Array(1);
    const thetaBase = new Float64Array(1);
    const logJ = s.forward(u, 0, theta, 0);
    const logJBase = b.forward(Float64Array.of(0.7 + 0.03 * 1.3), 0, thetaBase, 0);
    expect(theta[0]).toBe(thetaBase[0]);
    expect(logJ).toBeCloseTo(logJBase + Math.log(0.03), 14);
    const f = (x: number): number => {
      const t = new Float64Array(1);
      const logJacobian = s.forward(Float64Array.of(x), 0, t, 0);
      return 5 * t[0] + logJacobian;
    };
    const gU = new Float64Array(1);
    s.backward(u, 0, theta, 0, Float64Array.of(5), 0, gU, 0);
    expect(gU[0]).toBeCloseTo((f(1.3 + 1e-6) - f(1.3 - 1e-6)) / 2e-6, 7);
    const back = new Float64Array(1);
    expect(s.inverse(theta, 0, back, 0)).toBe(true);
    expect(back[0]).toBeCloseTo(1.3, 10);
  });

  it('keeps a period exact to float64 when the scale is far below float32 spacing', () => {
    // P = 3.2 d has a float32 spacing of 2.4e-7 d; a step of 1e-9 d must still move it.
    const s = centredSupport(supports.real(), [3.2], [1e-9]).bind(1);
    const t = new Float64Array(1);
    s.forward(Float64Array.of(1), 0, t, 0);
    expect(t[0] - 3.2).toBeCloseTo(1e-9, 15); // float64 spacing at 3.2 is 4.4e-16
    expect(Math.fround(t[0])).toBe(Math.fround(3.2));
  });

  it('rejects scales that are not finite and positive', () => {
    expect(() => centredSupport(supports.real(), [0], [0])).toThrow(/scale\[0\] = 0/);
  });
});

describe('impact fraction support (stretched logistic coordinate)', () => {
  const t = impactFractionSupport().bind(1);
  const at = (w: number): { beta: number; logJ: number } => {
    const theta = new Float64Array(1);
    const logJ = t.forward(Float64Array.of(w), 0, theta, 0);
    return { beta: theta[0], logJ };
  };

  it('is w = v √(1 + v²/ρ²) of the logistic coordinate v = ln((1 + β)/(1 − β))', () => {
    // The definition in supports/impactFraction.ts, inverted by hand at chosen β.
    for (const beta of [-0.97, -0.5, -1e-9, 0, 0.2, 0.46, 0.9, 1 - 1e-9]) {
      const v = Math.log((1 + beta) / (1 - beta));
      const w = v * Math.sqrt(1 + (v / IMPACT_STRETCH) ** 2);
      const back = new Float64Array(1);
      expect(t.inverse([beta], 0, back, 0)).toBe(true);
      expect(back[0]).toBeCloseTo(w, 9);
      expect(at(w).beta).toBeCloseTo(beta, 12);
    }
    expect(t.inverse([1], 0, new Float64Array(1), 0)).toBe(false);
    expect(t.inverse([-1], 0, new Float64Array(1), 0)).toBe(false);
  });

  it('carries the density: log|dβ/dw| against central differences, and a uniform β integrates to 2', () => {
    for (const w of [-40, -3.1, -0.4, -1e-7, 0, 0.25, 1.7, 12, 300]) {
      const h = 1e-6 * Math.max(1, Math.abs(w));
      const slope = (at(w + h).beta - at(w - h).beta) / (2 * h);
      if (slope > 1e-300) expect(at(w).logJ).toBeCloseTo(Math.log(slope), 6);
    }
    // ∫ |dβ/dw| dw over the real line is the length of (−1, 1) (change of variables).
    let mass = 0;
    // Beyond |w| = 3000 (v ≈ 39) less than 1e-16 of the mass remains.
    const n = 2000000;
    const span = 3000;
    for (let i = 0; i < n; i++) mass += Math.exp(at(-span + ((i + 0.5) * 2 * span) / n).logJ) * ((2 * span) / n);
    expect(mass).toBeCloseTo(2, 6);
  });

  it('stays finite and monotone for the largest coordinates a diverging trajectory can reach', () => {
    let previous = -1;
    for (const w of [-1e308, -1e200, -1e20, -50, 50, 1e20, 1e200, 1e308]) {
      const r = at(w);
      expect(Number.isNaN(r.beta) || Number.isNaN(r.logJ)).toBe(false);
      expect(r.beta).toBeGreaterThanOrEqual(previous);
      previous = r.beta;
      const gU = new Float64Array(1);
      t.backward(Float64Array.of(w), 0, Float64Array.of(r.beta), 0, Float64Array.of(3), 0, gU, 0);
      expect(Number.isNaN(gU[0])).toBe(false);
    }
    // Far out, v = sign(w) √(ρ|w|): β = tanh(v/2) is ±1 and log|dβ/dw| ≈ −v (from the
    // definition: dβ/dv ≈ 2e^(−v), dw/dv ≈ 2v/ρ; v is √(ρw) to 1e-4 here).
    expect(at(1e6).logJ).toBeCloseTo(Math.log(2) - Math.sqrt(IMPACT_STRETCH * 1e6) - Math.log((2 * Math.sqrt(IMPACT_STRETCH * 1e6)) / IMPACT_STRETCH), 3);
  });

  it('chains gradients: backward against central differences of β·g + log|dβ/dw|', () => {
    for (const w of [-5, -0.8, -1e-6, 0, 0.3, 2.2, 9]) {
      const g = -7.5;
      const f = (x: number): number => {
        const r = at(x);
        return g * r.beta + r.logJ;
      };
      const theta = new Float64Array(1);
      t.forward(Float64Array.of(w), 0, theta, 0);
      const gU = new Float64Array(1);
      t.backward(Float64Array.of(w), 0, theta, 0, Float64Array.of(g), 0, gU, 0);
      const h = 1e-6;
      expect(gU[0]).toBeCloseTo((f(w + h) - f(w - h)) / (2 * h), 6);
    }
  });
});

describe('eccentricity prior on the disk', () => {
  /** ∫ over the disk of exp(log p) within radius √eMax, by polar quadrature. */
  function massBelow(prior: ReturnType<typeof eccentricityDiskPrior>, eMax: number): number {
    const x = new Float64Array(2);
    let sum = 0;
    const nr = 4000;
    const nw = 64;
    const rMax = Math.sqrt(eMax);
    for (let i = 0; i < nr; i++) {
      const r = ((i + 0.5) / nr) * rMax;
      for (let j = 0; j < nw; j++) {
        const w = (2 * Math.PI * (j + 0.5)) / nw;
        x[0] = r * Math.cos(w);
        x[1] = r * Math.sin(w);
        sum += Math.exp(prior.logDensity(x, 0, 2)) * r * (rMax / nr) * ((2 * Math.PI) / nw);
      }
    }
    return sum;
  }

  it('has the given marginal of e (uniform, and a beta density) and omega uniform', () => {
    expect(massBelow(eccentricityDiskPrior(), 1 - 1e-12)).toBeCloseTo(1, 5);
    expect(massBelow(eccentricityDiskPrior(), 0.3)).toBeCloseTo(0.3, 5);
    // Beta(0.867, 3.03), the eccentricity distribution of Kipping (2013, MNRAS 434, L51).
    const beta = priors.beta(0.867, 3.03);
    let cdf = 0;
    const n = 200000;
    for (let i = 0; i < n; i++) {
      const e = ((i + 0.5) / n) * 0.2;
      cdf += Math.exp(beta.logDensity(e)) * (0.2 / n);
    }
    expect(massBelow(eccentricityDiskPrior(beta), 0.2)).toBeCloseTo(cdf, 3);
  });

  it('adds the exact gradient', () => {
    const p = eccentricityDiskPrior(priors.beta(0.867, 3.03));
    const x = Float64Array.of(0.21, -0.33);
    const g = new Float64Array(2);
    p.addGradient(x, 0, 2, g, 0);
    for (let k = 0; k < 2; k++) {
      const up = Float64Array.from(x);
      const down = Float64Array.from(x);
      up[k] += 1e-6;
      down[k] -= 1e-6;
      expect(g[k]).toBeCloseTo((p.logDensity(up, 0, 2) - p.logDensity(down, 0, 2)) / 2e-6, 6);
    }
  });
});

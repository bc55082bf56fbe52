import { createRandomStream, priors, supports } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { centredSupport } from '../src/builders/supports/centred.js';
import { unitDisk, unitDiskInternals } from '../src/builders/supports/unitDisk.js';
import { eccentricityDiskPrior } from '../src/builders/eccentricityPrior.js';

/**
 * The builders' own supports: the unit disk (for the eccentricity vector
 * (√e cos ω, √e sin ω)) and the centred, scaled wrapper; and the eccentricity prior on
 * the disk. Checks: round trips, log-Jacobians against numerical Jacobian determinants,
 * the chain rule against central differences, and normalisation by quadrature
 * (change of variables, standard calculus).
 */

const disk = unitDisk().bind(2);

function forward(u: [number, number]): { x: [number, number]; logJ: number } {
  const out = new Float64Array(2);
  const logJ = disk.forward(Float64Array.from(u), 0, out, 0);
  return { x: [out[0], out[1]], logJ };
}

describe('unit disk support', () => {
  it('round trips points of the disk, including its centre and near its rim', () => {
    for (const [x, y] of [
      [0, 0],
      [1e-12, -3e-12],
      [0.3, -0.2],
      [-0.6, 0.7],
      [0.999999, 0],
      [0, -0.9999999],
    ]) {
      const u = new Float64Array(2);
      expect(disk.inverse([x, y], 0, u, 0)).toBe(true);
      const back = forward([u[0], u[1]]).x;
      expect(back[0]).toBeCloseTo(x, 12);
      expect(back[1]).toBeCloseTo(y, 12);
    }
    expect(disk.inverse([0.8, 0.6], 0, new Float64Array(2), 0)).toBe(false); // on the rim
    expect(disk.inverse([Number.NaN, 0], 0, new Float64Array(2), 0)).toBe(false);
  });

  it('returns the log-determinant of the numerical Jacobian (central differences)', () => {
    for (const u of [
      [0, 0],
      [1e-7, 2e-7],
      [0.1, -0.05],
      [0.2, 0.15], // r = 0.25: where the series for q switches
      [0.7, -1.1],
      [3, 2],
      [-6, 1],
    ] as [number, number][]) {
      const h = 1e-6;
      const J: number[][] = [];
      for (let k = 0; k < 2; k++) {
        const up: [number, number] = [...u];
        const down: [number, number] = [...u];
        up[k] += h;
        down[k] -= h;
        const a = forward(up).x;
        const b = forward(down).x;
        J.push([(a[0] - b[0]) / (2 * h), (a[1] - b[1]) / (2 * h)]);
      }
      const det = Math.abs(J[0][0] * J[1][1] - J[0][1] * J[1][0]);
      // Relative agreement: far out (r = 7) the determinant is 3e-6 and differences lose digits.
      expect(Math.abs(det / Math.exp(forward(u).logJ) - 1)).toBeLessThan(2e-5);
    }
  });

  it('chains gradients exactly: backward equals central differences of g·x(u) + log|det|', () => {
    const stream = createRandomStream('disk-backward');
    for (let trial = 0; trial < 20; trial++) {
      const r = trial < 4 ? 10 ** (-8 + trial) : 3 * stream.uniform();
      const phi = 2 * Math.PI * stream.uniform();
      const u: [number, number] = [r * Math.cos(phi), r * Math.sin(phi)];
      const gx = [stream.normal(), stream.normal()];
      const f = (v: [number, number]): number => {
        const { x, logJ } = forward(v);
        return gx[0] * x[0] + gx[1] * x[1] + logJ;
      };
      const gu = new Float64Array(2);
      const theta = new Float64Array(2);
      disk.forward(Float64Array.from(u), 0, theta, 0);
      disk.backward(Float64Array.from(u), 0, theta, 0, Float64Array.from(gx), 0, gu, 0);
      for (let k = 0; k < 2; k++) {
        const h = 1e-6;
        const up: [number, number] = [...u];
        const down: [number, number] = [...u];
        up[k] += h;
        down[k] -= h;
        expect(gu[k]).toBeCloseTo((f(up) - f(down)) / (2 * h), 6);
      }
    }
  });

  it('has a continuous curvature term across its series switch and q(0) = -2/3', () => {
    const { curvature } = unitDiskInternals;
    expect(curvature(0)).toBeCloseTo(-2 / 3, 15);
    // Direct form (sech² r − tanh(r)/r)/r² at r = 0.25 (little cancellation there).
    const r = 0.25;
    const direct = (1 / Math.cosh(r) ** 2 - Math.tanh(r) / r) / (r * r);
    expect(curvature(r - 1e-12)).toBeCloseTo(direct, 10);
    expect(curvature(r + 1e-12)).toBeCloseTo(direct, 10);
  });

  it('carries the uniform density on the disk to a normalised density on the plane', () => {
    // ∫ (1/π) |det| du over ℝ² in polar coordinates: 2 ∫₀^∞ r e^{logJ(r)} dr (= [tanh² r]₀^∞ = 1).
    let sum = 0;
    const dr = 1e-4;
    for (let r = dr / 2; r < 25; r += dr) sum += 2 * r * Math.exp(forward([r, 0]).logJ) * dr;
    expect(sum).toBeCloseTo(1, 6);
  });
});

describe('disk of radius below 1 (an eccentricity cap)', () => {
  it('has area π R² under its map, and round trips', () => {
    const R = Math.sqrt(0.5);
    const t = unitDisk(R).bind(2);
    let sum = 0;
    const dr = 1e-4;
    const out = new Float64Array(2);
    for (let r = dr / 2; r < 25; r += dr) sum += 2 * Math.PI * r * Math.exp(t.forward(Float64Array.of(r, 0), 0, out, 0)) * dr;
    expect(sum).toBeCloseTo(Math.PI * R * R, 6);
    const u = new Float64Array(2);
    expect(t.inverse([0.4, -0.5], 0, u, 0)).toBe(true);
    t.forward(u, 0, out, 0);
    expect(out[0]).toBeCloseTo(0.4, 12);
    expect(t.inverse([0.6, 0.6], 0, u, 0)).toBe(false); // e = 0.72 > 0.5
  });
});

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

import { createRandomStream, supports } from '@apsis/core';
import { describe, expect, it } from 'vitest';

/**
 * The unit-disk support (`supports.unitDisk(radius?)`): 2-vectors inside a disk through
 * the radial map u ↦ (tanh|u|/|u|) u (scaled by the radius). Checks: round trips,
 * log-Jacobians against numerical Jacobian determinants, the chain rule against central
 * differences (including |u| → 0 and the switch of its series at |u| = 0.25), and the
 * normalisation ∫ |det| du = π R² by quadrature (change of variables, standard calculus).
 */
const unitDisk = supports.unitDisk;
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

  it('chains gradients on both sides of the series switch at |u| = 0.25', () => {
    for (const r of [0.25 - 1e-9, 0.25 + 1e-9, 0.249, 0.251]) {
      const u = Float64Array.of(r * 0.6, r * 0.8);
      const gx = Float64Array.of(0.7, -1.3);
      const theta = new Float64Array(2);
      const gu = new Float64Array(2);
      disk.forward(u, 0, theta, 0);
      disk.backward(u, 0, theta, 0, gx, 0, gu, 0);
      for (let k = 0; k < 2; k++) {
        const f = (v: [number, number]): number => {
          const { x, logJ } = forward(v);
          return gx[0] * x[0] + gx[1] * x[1] + logJ;
        };
        const up: [number, number] = [u[0], u[1]];
        const down: [number, number] = [u[0], u[1]];
        up[k] += 1e-6;
        down[k] -= 1e-6;
        expect(gu[k]).toBeCloseTo((f(up) - f(down)) / 2e-6, 7);
      }
    }
  });

  it('rejects a radius outside (0, 1] and sizes other than 2', () => {
    expect(() => unitDisk(1.5)).toThrow(/unitDisk\.radius = 1\.5: expected a number in \(0, 1\]/);
    expect(() => unitDisk().bind(3)).toThrow(/unitDisk size = 3: expected exactly 2/);
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


import { describe, expect, it } from 'vitest';
import {
  isPhysicalLimbDarkening,
  kippingFromLimbDarkening,
  kippingJacobianInto,
  limbDarkeningFromKipping,
} from '../src/transit/limbDarkening.js';
import { TransitParameterError } from '../src/transit/errors.js';

/** Intensity profile checks done directly on I(mu) over a fine mu grid. */
function profileIsPhysical(u1: number, u2: number): boolean {
  let prev = Infinity;
  for (let i = 0; i <= 400; i++) {
    const mu = 1 - i / 400; // from the centre (mu = 1) to the limb (mu = 0)
    const I = 1 - u1 * (1 - mu) - u2 * (1 - mu) ** 2;
    if (I < -1e-12 || I > prev + 1e-12) return false;
    prev = I;
  }
  return true;
}

describe('Kipping (2013) limb-darkening parametrisation', () => {
  it('maps a grid of (q1, q2) in [0, 1]² inside the physical region (Kipping 2013, eqs. 8-10, 15-16)', () => {
    for (let i = 0; i <= 20; i++) {
      for (let j = 0; j <= 20; j++) {
        const { u1, u2 } = limbDarkeningFromKipping(i / 20, j / 20);
        expect(isPhysicalLimbDarkening(u1, u2) || Math.abs(u1 + u2 - 1) < 1e-15).toBe(true);
        // Independent of the three inequalities: the profile itself is non-negative
        // and non-increasing outward.
        expect(profileIsPhysical(u1, u2), `q = (${i / 20}, ${j / 20})`).toBe(true);
      }
    }
  });

  it('covers the physical region: every physical (u1, u2) comes from some (q1, q2) in [0, 1]²', () => {
    // Scan a box around the region (vertices (0,0), (0,1), (2,-1)).
    let inside = 0;
    for (let i = 0; i <= 60; i++) {
      for (let j = 0; j <= 60; j++) {
        const u1 = -0.2 + (2.4 * i) / 60 + 1e-7;
        const u2 = -1.2 + (2.4 * j) / 60 + 1e-7;
        const { q1, q2 } = kippingFromLimbDarkening(u1, u2);
        // (u1, u2) is reached from the unit square when its inverse image lies in the
        // square and maps back to it (q1 = (u1 + u2)² forgets the sign of u1 + u2).
        const inSquare = q1 >= 0 && q1 <= 1 && q2 >= 0 && q2 <= 1;
        const back = inSquare ? limbDarkeningFromKipping(q1, q2) : { u1: NaN, u2: NaN };
        const covered = Math.abs(back.u1 - u1) + Math.abs(back.u2 - u2) < 1e-13;
        expect(covered, `u = (${u1}, ${u2})`).toBe(isPhysicalLimbDarkening(u1, u2));
        // Independent of the three inequalities: the profile itself.
        expect(profileIsPhysical(u1, u2), `u = (${u1}, ${u2})`).toBe(covered);
        if (covered) inside++;
      }
    }
    // The region has area 1 of the 5.76 box: about 17% of the grid points.
    expect(inside / 61 ** 2).toBeGreaterThan(0.15);
    expect(inside / 61 ** 2).toBeLessThan(0.19);
  });

  it('has the analytic Jacobian, with determinant -1 (uniform q means uniform u)', () => {
    const J = new Float64Array(4);
    for (const [q1, q2] of [
      [0.3, 0.2],
      [0.81, 0.5],
      [0.05, 0.95],
    ]) {
      kippingJacobianInto(q1, q2, J);
      const h = 1e-6;
      const a = limbDarkeningFromKipping(q1 + h, q2);
      const b = limbDarkeningFromKipping(q1 - h, q2);
      const c = limbDarkeningFromKipping(q1, q2 + h);
      const d = limbDarkeningFromKipping(q1, q2 - h);
      expect(Math.abs(J[0] - (a.u1 - b.u1) / (2 * h))).toBeLessThan(1e-8);
      expect(Math.abs(J[2] - (a.u2 - b.u2) / (2 * h))).toBeLessThan(1e-8);
      expect(Math.abs(J[1] - (c.u1 - d.u1) / (2 * h))).toBeLessThan(1e-8);
      expect(Math.abs(J[3] - (c.u2 - d.u2) / (2 * h))).toBeLessThan(1e-8);
      expect(Math.abs(J[0] * J[3] - J[1] * J[2] + 1)).toBeLessThan(1e-14);
    }
  });

  it('rejects q outside [0, 1]', () => {
    expect(() => limbDarkeningFromKipping(1.2, 0.5)).toThrow(TransitParameterError);
    expect(() => limbDarkeningFromKipping(0.5, -0.1)).toThrow(/q2 = -0.1/);
    expect(() => kippingJacobianInto(0, 0.5, new Float64Array(4))).toThrow(/q1/);
  });
});

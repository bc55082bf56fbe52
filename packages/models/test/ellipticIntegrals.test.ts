import { describe, expect, it } from 'vitest';
import {
  completeEllipticE,
  completeEllipticK,
  completeEllipticPi,
  generalCompleteEllipticIntegral,
} from '../src/transit/ellipticIntegrals.js';
import { TransitParameterError } from '../src/transit/errors.js';
import { integrateWithEndpointMap } from './support/diskIntegration.js';

/** Arithmetic–geometric mean (Gauss). */
function agm(a: number, b: number): number {
  for (let i = 0; i < 60 && Math.abs(a - b) > 1e-16 * a; i++) {
    const m = (a + b) / 2;
    b = Math.sqrt(a * b);
    a = m;
  }
  return (a + b) / 2;
}

/** Gauss's AGM form K(m) = π / (2 AGM(1, √(1 - m))) (DLMF 19.8.5), independent of cel. */
function kByAgm(m: number): number {
  return Math.PI / (2 * agm(1, Math.sqrt(1 - m)));
}

/** Direct quadrature of the defining integral (smooth integrand away from m = 1). */
function quadrature(f: (phi: number) => number): number {
  return integrateWithEndpointMap(f, 0, Math.PI / 2, 200);
}

describe('complete elliptic integrals (Bulirsch cel)', () => {
  it('K and E at m = 0 equal π/2; E(1) = 1 (standard values)', () => {
    expect(completeEllipticK(0)).toBeCloseTo(Math.PI / 2, 15);
    expect(completeEllipticE(0)).toBeCloseTo(Math.PI / 2, 15);
    expect(completeEllipticE(1)).toBe(1);
  });

  it('K at m = 1/2 equals Γ(1/4)² / (4√π) (lemniscatic case; formula and Γ(1/4) = 3.625609908221908 from memory)', () => {
    const gammaQuarter = 3.625609908221908;
    expect(Math.abs(completeEllipticK(0.5) - (gammaQuarter * gammaQuarter) / (4 * Math.sqrt(Math.PI)))).toBeLessThan(2e-15);
  });

  it('K agrees with Gauss’s AGM formula across m, including m near 1', () => {
    for (const m of [1e-12, 0.01, 0.3, 0.5, 0.9, 0.999, 1 - 1e-8, 1 - 1e-14]) {
      const ref = kByAgm(m);
      expect(Math.abs(completeEllipticK(m) - ref) / ref).toBeLessThan(4e-15);
    }
  });

  it('satisfies Legendre’s relation E K′ + E′ K − K K′ = π/2 (DLMF 19.7.1)', () => {
    for (const m of [0.001, 0.1, 0.37, 0.5, 0.8, 0.99]) {
      const K = completeEllipticK(m);
      const E = completeEllipticE(m);
      const Kp = completeEllipticK(1 - m);
      const Ep = completeEllipticE(1 - m);
      expect(Math.abs(E * Kp + Ep * K - K * Kp - Math.PI / 2)).toBeLessThan(4e-15);
    }
  });

  it('E and Π agree with direct quadrature of their defining integrals', () => {
    for (const m of [0.05, 0.5, 0.9]) {
      const e = quadrature((p) => Math.sqrt(1 - m * Math.sin(p) ** 2));
      expect(Math.abs(completeEllipticE(m) - e)).toBeLessThan(1e-14);
      for (const n of [-1e6, -30, -1, -0.01, 0.3, 0.95]) {
        const pi = quadrature((p) => 1 / ((1 - n * Math.sin(p) ** 2) * Math.sqrt(1 - m * Math.sin(p) ** 2)));
        expect(Math.abs(completeEllipticPi(n, m) - pi) / pi).toBeLessThan(1e-13);
      }
    }
  });

  it('Π(n, 0) = π / (2√(1 − n)) (elementary integral: tan φ substitution; from memory)', () => {
    for (const n of [-100, -1, 0, 0.5, 0.99]) {
      expect(Math.abs(completeEllipticPi(n, 0) - Math.PI / (2 * Math.sqrt(1 - n)))).toBeLessThan(1e-13);
    }
  });

  it('cel with b = 0 stays finite at kc → 0 and matches its closed form a·atan√(p − 1)/√(p − 1)', () => {
    // At kc = 0 the integrand a cos²φ / ((cos²φ + p sin²φ)|cos φ|) integrates to
    // a·atan(√(p - 1))/√(p - 1) for p > 1 (substitute u = sin φ).
    const p = 3;
    const exact = Math.atan(Math.sqrt(p - 1)) / Math.sqrt(p - 1);
    expect(Math.abs(generalCompleteEllipticIntegral(1e-300, p, 1, 0) - exact)).toBeLessThan(1e-15);
    expect(Math.abs(generalCompleteEllipticIntegral(1e-9, p, 1, 0) - exact)).toBeLessThan(1e-14);
  });

  it('rejects arguments outside the domain, naming the field', () => {
    expect(() => completeEllipticK(1)).toThrow(TransitParameterError);
    expect(() => completeEllipticK(-0.1)).toThrow(/m = -0.1/);
    expect(() => completeEllipticPi(1, 0.5)).toThrow(/n = 1/);
    expect(() => generalCompleteEllipticIntegral(0.5, 0, 1, 1)).toThrow(/p = 0/);
    expect(() => generalCompleteEllipticIntegral(0, 1, 1, 1)).toThrow(/kc = 0/);
  });
});

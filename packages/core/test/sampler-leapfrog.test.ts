import { describe, expect, it } from 'vitest';
import { createRandomStream } from '../src/random/index.js';
import {
  applyInverseMass,
  choleskyLower,
  createPhasePoint,
  denseMetric,
  diagonalMetric,
  drawMomentum,
  identityMetric,
  kineticEnergy,
  leapfrogStep,
  type Metric,
  type PhasePoint,
} from '../src/sampler/index.js';
import type { Target } from '../src/target.js';
import { correlatedPair, gaussianWithPrecision, invertSymmetric } from './support/targets.js';

function startPoint(target: Target, metric: Metric, q: number[], p: number[]): PhasePoint {
  const z = createPhasePoint(target.dim);
  z.position.set(q);
  z.momentum.set(p);
  z.logDensity = target.logDensityGrad(z.position, z.gradient);
  applyInverseMass(metric, z.gradient, z.scaledGradient);
  applyInverseMass(metric, z.momentum, z.velocity);
  z.kinetic = kineticEnergy(z.momentum, z.velocity);
  return z;
}

const oscillator: Target = {
  dim: 1,
  logDensityGrad(x, g) {
    g[0] = -x[0];
    return -0.5 * x[0] * x[0];
  },
};

describe('leapfrog integrator', () => {
  it('matches the exact flow of the harmonic oscillator to O(ε²)', () => {
    // H = q²/2 + p²/2 has the exact flow q(t) = q0 cos t + p0 sin t (common practice);
    // leapfrog is a second-order method, so halving ε divides the error at a fixed
    // time by 4 (Hairer, Lubich & Wanner 2006, Geometric Numerical Integration, ch. II).
    const metric = identityMetric('unit', 1);
    const errorAt = (eps: number): number => {
      const z = startPoint(oscillator, metric, [1], [0.5]);
      const steps = Math.round(2 / eps);
      for (let s = 0; s < steps; s++) leapfrogStep(oscillator, metric, eps, z);
      const t = steps * eps;
      return Math.abs(z.position[0] - (Math.cos(t) + 0.5 * Math.sin(t)));
    };
    const e1 = errorAt(0.1);
    const e2 = errorAt(0.05);
    const e3 = errorAt(0.025);
    expect(e1 / e2).toBeGreaterThan(3.6);
    expect(e1 / e2).toBeLessThan(4.4);
    expect(e2 / e3).toBeGreaterThan(3.6);
    expect(e2 / e3).toBeLessThan(4.4);
  });

  it('keeps the energy error bounded and of order ε² over long trajectories', () => {
    // For the oscillator, leapfrog exactly conserves the modified energy
    // p²/2 + (1 − ε²/4) q²/2, so |H − H0| ≤ (ε²/8) q_max² with no drift
    // (Leimkuhler & Reich 2004, Simulating Hamiltonian Dynamics, sec. 4.3; from memory).
    const metric = identityMetric('unit', 1);
    const maxError = (eps: number): number => {
      const z = startPoint(oscillator, metric, [1], [0]);
      const h0 = z.kinetic - z.logDensity;
      let worst = 0;
      for (let s = 0; s < 20000; s++) {
        leapfrogStep(oscillator, metric, eps, z);
        worst = Math.max(worst, Math.abs(z.kinetic - z.logDensity - h0));
      }
      return worst;
    };
    const a = maxError(0.2);
    const b = maxError(0.1);
    expect(a).toBeLessThan((0.2 ** 2 / 8) * 1.1);
    expect(a / b).toBeGreaterThan(3.6);
    expect(a / b).toBeLessThan(4.4);
  });

  it('is reversible: negating the momentum retraces the path (dense metric, 5-D Gaussian)', () => {
    // Time reversibility of the Störmer–Verlet map (Neal 2011, "MCMC using Hamiltonian
    // dynamics", sec. 2.3): F ∘ R ∘ F = R with R flipping p.
    const dim = 5;
    const rng = createRandomStream('reversibility');
    const a = new Float64Array(dim * dim);
    for (let i = 0; i < dim; i++) for (let j = 0; j < dim; j++) a[i * dim + j] = rng.normal();
    const cov = new Float64Array(dim * dim);
    for (let i = 0; i < dim; i++)
      for (let j = 0; j < dim; j++) {
        let s = i === j ? 0.5 : 0;
        for (let k = 0; k < dim; k++) s += a[i * dim + k] * a[j * dim + k];
        cov[i * dim + j] = s;
      }
    const target = gaussianWithPrecision(invertSymmetric(cov, dim), dim);
    for (const metric of [identityMetric('unit', dim), diagonalMetric([1, 2, 0.5, 3, 1]), denseMetric(cov, dim)]) {
      const q0 = [0.3, -1, 2, 0.1, -0.7];
      const p0 = [1, 0.2, -0.4, 0.9, -1.3];
      const z = startPoint(target, metric, q0, p0);
      for (let s = 0; s < 50; s++) leapfrogStep(target, metric, 0.05, z);
      for (let i = 0; i < dim; i++) {
        z.momentum[i] = -z.momentum[i];
        z.velocity[i] = -z.velocity[i];
      }
      for (let s = 0; s < 50; s++) leapfrogStep(target, metric, 0.05, z);
      for (let i = 0; i < dim; i++) {
        expect(z.position[i]).toBeCloseTo(q0[i], 10);
        expect(-z.momentum[i]).toBeCloseTo(p0[i], 10);
      }
    }
  });

  it('integrating with −ε runs the flow backward', () => {
    const metric = identityMetric('unit', 1);
    const z = startPoint(oscillator, metric, [1], [0.5]);
    for (let s = 0; s < 40; s++) leapfrogStep(oscillator, metric, 0.05, z);
    for (let s = 0; s < 40; s++) leapfrogStep(oscillator, metric, -0.05, z);
    expect(z.position[0]).toBeCloseTo(1, 12);
    expect(z.momentum[0]).toBeCloseTo(0.5, 12);
  });

  it('flags nothing itself: a non-finite density propagates into the energy', () => {
    const wall: Target = {
      dim: 1,
      logDensityGrad(x, g) {
        g[0] = -1;
        return x[0] > 1 ? Number.NaN : -x[0];
      },
    };
    const metric = identityMetric('unit', 1);
    const z = startPoint(wall, metric, [0.9], [5]);
    leapfrogStep(wall, metric, 0.1, z);
    expect(Number.isNaN(z.kinetic - z.logDensity)).toBe(true);
  });
});

describe('Euclidean metrics', () => {
  it('Cholesky factor reproduces the matrix', () => {
    const { covariance } = correlatedPair(0.9);
    const l = choleskyLower(covariance, 2)!;
    expect(l[0] * l[0]).toBeCloseTo(1, 14);
    expect(l[2] * l[0]).toBeCloseTo(0.9, 14);
    expect(l[2] * l[2] + l[3] * l[3]).toBeCloseTo(1, 14);
    expect(l[1]).toBe(0);
    expect(choleskyLower(Float64Array.from([1, 2, 2, 1]), 2)).toBeNull();
  });

  it('dense momentum draws have covariance M = Σ⁻¹ and velocity Σ p', () => {
    // p ~ N(0, M): the sample covariance of n draws matches M entrywise within 4 se,
    // se(M̂_ij) = sqrt((M_ij² + M_ii M_jj) / n) (Wishart variance, common practice).
    const cov = Float64Array.from([2, 0.6, 0.3, 0.6, 1, -0.2, 0.3, -0.2, 0.5]);
    const dim = 3;
    const metric = denseMetric(cov, dim);
    const mass = invertSymmetric(cov, dim);
    const rng = createRandomStream('momentum');
    const n = 40000;
    const p = new Float64Array(dim);
    const v = new Float64Array(dim);
    const check = new Float64Array(dim);
    const acc = new Float64Array(dim * dim);
    let worstVelocity = 0;
    let worstKinetic = 0;
    for (let s = 0; s < n; s++) {
      drawMomentum(metric, rng, p, v);
      applyInverseMass(metric, p, check);
      for (let i = 0; i < dim; i++) worstVelocity = Math.max(worstVelocity, Math.abs(check[i] - v[i]));
      let quad = 0;
      for (let i = 0; i < dim; i++) for (let j = 0; j < dim; j++) quad += p[i] * cov[i * dim + j] * p[j];
      worstKinetic = Math.max(worstKinetic, Math.abs(kineticEnergy(p, v) - 0.5 * quad));
      for (let i = 0; i < dim; i++) for (let j = 0; j < dim; j++) acc[i * dim + j] += p[i] * p[j];
    }
    expect(worstVelocity).toBeLessThan(1e-12);
    expect(worstKinetic).toBeLessThan(1e-12);
    for (let i = 0; i < dim; i++)
      for (let j = 0; j < dim; j++) {
        const se = Math.sqrt((mass[i * dim + j] ** 2 + mass[i * dim + i] * mass[j * dim + j]) / n);
        expect(Math.abs(acc[i * dim + j] / n - mass[i * dim + j])).toBeLessThan(4 * se);
      }
  });

  it('diagonal momentum draws have variance 1 / inverseMass', () => {
    const metric = diagonalMetric([4, 0.25]);
    const rng = createRandomStream('diag momentum');
    const n = 40000;
    const p = new Float64Array(2);
    const v = new Float64Array(2);
    let s0 = 0;
    let s1 = 0;
    let worstVelocity = 0;
    for (let s = 0; s < n; s++) {
      drawMomentum(metric, rng, p, v);
      s0 += p[0] * p[0];
      s1 += p[1] * p[1];
      worstVelocity = Math.max(worstVelocity, Math.abs(v[0] - 4 * p[0]), Math.abs(v[1] - 0.25 * p[1]));
    }
    expect(worstVelocity).toBeLessThan(1e-12);
    // se of a variance estimate: σ² sqrt(2/n) (common practice).
    expect(Math.abs(s0 / n - 0.25)).toBeLessThan(4 * 0.25 * Math.sqrt(2 / n));
    expect(Math.abs(s1 / n - 4)).toBeLessThan(4 * 4 * Math.sqrt(2 / n));
  });

  it('rejects invalid metrics', () => {
    expect(() => diagonalMetric([1, 0])).toThrow(/inverseMass\[1\] = 0/);
    expect(() => denseMetric([1, 2, 2, 1], 2)).toThrow(/positive definite/);
    expect(() => denseMetric([1, 0.5, 0.4, 1], 2)).toThrow(/symmetric/);
  });
});

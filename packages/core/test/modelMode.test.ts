import { describe, expect, it } from 'vitest';
import {
  compileModel,
  findMode,
  float64Likelihood,
  handWrittenTarget,
  ModeSearchOptionsError,
  priors,
  supports,
} from '../src/model/index.js';

/** log p = −[(1 − x)² + 100 (y − x²)²]; unique maximum at (1, 1) (Rosenbrock 1960, The Computer Journal 3, 175). */
const rosenbrock = handWrittenTarget({
  dim: 2,
  logDensityGrad: (p, g) => {
    const [x, y] = p;
    g[0] = 2 * (1 - x) + 400 * x * (y - x * x);
    g[1] = -200 * (y - x * x);
    return -((1 - x) ** 2 + 100 * (y - x * x) ** 2);
  },
});

describe('posterior mode finder (L-BFGS, strong Wolfe line search)', () => {
  it('finds the Rosenbrock maximum from the classic start (−1.2, 1)', () => {
    const r = findMode(rosenbrock, { init: Float64Array.of(-1.2, 1), gradientTolerance: 1e-9, relativeTolerance: 0 });
    expect(r.converged).toBe(true);
    expect(r.reason).toBe('gradient below tolerance');
    expect(Math.abs(r.position[0] - 1)).toBeLessThan(1e-8);
    expect(Math.abs(r.position[1] - 1)).toBeLessThan(1e-8);
    expect(r.logDensity).toBeGreaterThan(-1e-16);
    expect(r.iterations).toBeLessThan(100);
  });

  it('finds the mean of a correlated 20-dimensional Gaussian', () => {
    // Precision matrix: tridiagonal 2.1 on the diagonal, −1 off it (positive definite by
    // diagonal dominance, common practice); mean mᵢ = sin(i).
    const n = 20;
    const m = Float64Array.from({ length: n }, (_, i) => Math.sin(i));
    const target = handWrittenTarget({
      dim: n,
      logDensityGrad: (x, g) => {
        let q = 0;
        for (let i = 0; i < n; i++) {
          const d = x[i] - m[i];
          const left = i > 0 ? x[i - 1] - m[i - 1] : 0;
          const right = i < n - 1 ? x[i + 1] - m[i + 1] : 0;
          const Pd = 2.1 * d - left - right;
          g[i] = -Pd;
          q += d * Pd;
        }
        return -0.5 * q;
      },
    });
    const r = findMode(target);
    expect(r.converged).toBe(true);
    for (let i = 0; i < n; i++) expect(Math.abs(r.position[i] - m[i])).toBeLessThan(1e-6);
  });

  it('on a compiled regression model: the ridge closed form (normal priors, known noise)', async () => {
    // y = a + b x + noise, σ = 0.5, priors a, b ~ N(0, 2²): the posterior is normal with
    // mode (XᵀX/σ² + I/τ²)⁻¹ Xᵀy/σ² (Gelman et al., Bayesian Data Analysis, 3rd ed., ch. 14; common practice).
    const x = [-2, -1, -0.5, 0, 0.5, 1.5, 2, 3];
    const y = [-1.9, -0.1, 0.4, 1.2, 1.3, 3.1, 3.6, 5.2]; // invented
    const sigma = 0.5;
    const tau = 2;
    const model = await compileModel({
      parameters: [
        { name: 'a', prior: priors.normal(0, tau) },
        { name: 'b', prior: priors.normal(0, tau) },
      ],
      data: { x, y },
      likelihood: float64Likelihood((layout, data) => {
        const X = data.x as Float64Array;
        const Y = data.y as Float64Array;
        return (t, g) => {
          let ll = 0;
          for (let i = 0; i < X.length; i++) {
            const r = (Y[i] - t[0] - t[1] * X[i]) / sigma;
            ll -= 0.5 * r * r;
            g[0] += r / sigma;
            g[1] += (r / sigma) * X[i];
          }
          void layout;
          return ll;
        };
      }),
    });
    const n = x.length;
    const sx = x.reduce((s, v) => s + v, 0);
    const sxx = x.reduce((s, v) => s + v * v, 0);
    const sy = y.reduce((s, v) => s + v, 0);
    const sxy = x.reduce((s, v, i) => s + v * y[i], 0);
    const A = [
      [n / sigma ** 2 + 1 / tau ** 2, sx / sigma ** 2],
      [sx / sigma ** 2, sxx / sigma ** 2 + 1 / tau ** 2],
    ];
    const rhs = [sy / sigma ** 2, sxy / sigma ** 2];
    const det = A[0][0] * A[1][1] - A[0][1] * A[1][0];
    const a = (A[1][1] * rhs[0] - A[0][1] * rhs[1]) / det;
    const b = (A[0][0] * rhs[1] - A[1][0] * rhs[0]) / det;
    // Position error ≈ gradient tolerance / curvature (≈ 35 here).
    const r = findMode(model, { gradientTolerance: 1e-9 });
    expect(r.converged).toBe(true);
    expect(Math.abs(r.position[0] - a)).toBeLessThan(1e-8);
    expect(Math.abs(r.position[1] - b)).toBeLessThan(1e-8);
  });

  it('the mode is over unconstrained coordinates: gamma(3, 2) on a positive parameter peaks at s = 3/2', async () => {
    // p(u) ∝ (eᵘ)² e^{−2eᵘ} · eᵘ, maximal where 3 − 2eᵘ = 0 (calculus; the constrained mode is (α − 1)/β = 1).
    const model = await compileModel({ parameters: [{ name: 's', support: supports.positive(), prior: priors.gamma(3, 2) }] });
    const r = findMode(model, { init: Float64Array.of(2) });
    expect(r.converged).toBe(true);
    expect(Math.abs((model.constrain(r.position).s as number) - 1.5)).toBeLessThan(1e-8);
  });

  it('reports why it stopped without converging', () => {
    const limited = findMode(rosenbrock, { init: Float64Array.of(-1.2, 1), maxIterations: 3 });
    expect([limited.converged, limited.reason, limited.iterations]).toEqual([false, 'iteration limit reached', 3]);
    const dead = handWrittenTarget({ dim: 1, logDensityGrad: () => -Infinity });
    const r = findMode(dead);
    expect([r.converged, r.reason]).toEqual([false, 'non-finite log-density at the start']);
  });

  it('backs off from positions outside the support (non-finite log-density)', () => {
    // log p = ln x − x on x > 0 written directly (no transform): maximum at x = 1.
    const t = handWrittenTarget({
      dim: 1,
      logDensityGrad: (p, g) => {
        g[0] = 1 / p[0] - 1;
        return p[0] > 0 ? Math.log(p[0]) - p[0] : -Infinity;
      },
    });
    const r = findMode(t, { init: Float64Array.of(0.01) });
    expect(r.converged).toBe(true);
    expect(Math.abs(r.position[0] - 1)).toBeLessThan(1e-6);
  });

  it('validates its options, naming them', () => {
    expect(() => findMode(rosenbrock, { init: Float64Array.of(1) })).toThrow('findMode options.init = a Float64Array of length 1: expected a Float64Array of length 2 (target.dim)');
    expect(() => findMode(rosenbrock, { maxIterations: 0 })).toThrow(ModeSearchOptionsError);
    expect(() => findMode(rosenbrock, { tolerance: 1 } as never)).toThrow(/findMode options\.tolerance = 1: expected no such option/);
  });
});

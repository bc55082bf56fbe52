import { describe, expect, it } from 'vitest';
import { supports, type Support, type Transform } from '../src/model/index.js';

/**
 * Checks of every support's bijection against independent numerical facts:
 * - log|det J| from forward() equals the log of the absolute determinant of the
 *   Jacobian obtained by central differences of forward() (common practice);
 * - backward() equals the central-difference gradient of g·θ(u) + log|det J|(u)
 *   for a fixed vector g (chain rule, common practice);
 * - inverse and forward compose to the identity within 1e-12 (relative).
 */

/** log |det A| by Gaussian elimination with partial pivoting (common practice). */
function logAbsDet(a: number[][]): number {
  const n = a.length;
  const m = a.map((r) => r.slice());
  let logDet = 0;
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    [m[c], m[p]] = [m[p], m[c]];
    const pivot = m[c][c];
    logDet += Math.log(Math.abs(pivot));
    for (let r = c + 1; r < n; r++) {
      const f = m[r][c] / pivot;
      for (let k = c; k < n; k++) m[r][k] -= f * m[c][k];
    }
  }
  return logDet;
}

function forwardOf(t: Transform, u: ArrayLike<number>): { theta: Float64Array; logJ: number } {
  const theta = new Float64Array(t.constrainedLength);
  const logJ = t.forward(Float64Array.from(u), 0, theta, 0);
  return { theta, logJ };
}

/**
 * Central-difference Jacobian of the first `rows` constrained values in u. The step
 * 1e-4 keeps the truncation error (∝ h²) near 1e-9 relative while rounding stays small
 * where the map flattens (interval ends).
 */
function numericalJacobian(t: Transform, u: Float64Array, rows: number, h = 1e-4): number[][] {
  const J = Array.from({ length: rows }, () => new Array<number>(t.unconstrainedLength).fill(0));
  for (let k = 0; k < t.unconstrainedLength; k++) {
    const up = u.slice();
    const dn = u.slice();
    up[k] += h;
    dn[k] -= h;
    const a = forwardOf(t, up).theta;
    const b = forwardOf(t, dn).theta;
    for (let r = 0; r < rows; r++) J[r][k] = (a[r] - b[r]) / (2 * h);
  }
  return J;
}

function checkBackward(t: Transform, u: Float64Array, g: Float64Array): void {
  const { theta } = forwardOf(t, u);
  const gU = new Float64Array(t.unconstrainedLength);
  t.backward(u, 0, theta, 0, g, 0, gU, 0);
  const objective = (v: Float64Array): number => {
    const r = forwardOf(t, v);
    let s = r.logJ;
    for (let i = 0; i < g.length; i++) s += g[i] * r.theta[i];
    return s;
  };
  const h = 1e-6;
  for (let k = 0; k < u.length; k++) {
    const up = u.slice();
    const dn = u.slice();
    up[k] += h;
    dn[k] -= h;
    const fd = (objective(up) - objective(dn)) / (2 * h);
    expect(Math.abs(gU[k] - fd)).toBeLessThan(1e-6 * Math.max(1, Math.abs(fd)));
  }
}

function roundTripTheta(t: Transform, theta: number[]): void {
  const u = new Float64Array(t.unconstrainedLength);
  expect(t.inverse(theta, 0, u, 0)).toBe(true);
  const back = forwardOf(t, u).theta;
  for (let i = 0; i < theta.length; i++) {
    expect(Math.abs(back[i] - theta[i])).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(theta[i])));
  }
}

function roundTripU(t: Transform, u: number[]): void {
  const { theta } = forwardOf(t, u);
  const back = new Float64Array(t.unconstrainedLength);
  expect(t.inverse(theta, 0, back, 0)).toBe(true);
  for (let i = 0; i < u.length; i++) expect(Math.abs(back[i] - u[i])).toBeLessThanOrEqual(1e-12 * Math.max(1, Math.abs(u[i])));
}

const elementwise: { label: string; support: Support; us: number[]; thetas: number[] }[] = [
  { label: 'real', support: supports.real(), us: [-3.5, 0, 2.25], thetas: [-1e6, 0.5, 3] },
  { label: 'positive', support: supports.positive(), us: [-4, 0, 3.1], thetas: [1e-8, 1, 4.5e5] },
  { label: 'lowerBounded(-2)', support: supports.lowerBounded(-2), us: [-5, 0.3, 2], thetas: [-1.9999, 0, 77] },
  { label: 'upperBounded(10)', support: supports.upperBounded(10), us: [-5, 0.3, 2], thetas: [9.99999, 0, -300] },
  { label: 'interval(2, 5)', support: supports.interval(2, 5), us: [-9, -0.7, 0, 1.3, 9], thetas: [2.000001, 3.1, 4.999999] },
  { label: 'unitInterval', support: supports.unitInterval(), us: [-8, 0.4, 9], thetas: [1e-6, 0.5, 0.999] },
];

describe('elementwise bijections', () => {
  for (const c of elementwise) {
    it(`${c.label}: log-Jacobian, chain rule and round trips`, () => {
      const t = c.support.bind(c.us.length);
      const u = Float64Array.from(c.us);
      const J = numericalJacobian(t, u, c.us.length);
      expect(Math.abs(forwardOf(t, u).logJ - logAbsDet(J))).toBeLessThan(1e-7);
      checkBackward(t, u, Float64Array.from(c.us, (_, i) => 0.3 - 0.7 * i));
      roundTripTheta(c.support.bind(c.thetas.length), c.thetas);
      roundTripU(t, c.us);
    });
  }

  it('refuses values outside the support in inverse', () => {
    const u = new Float64Array(1);
    expect(supports.positive().bind(1).inverse([-1], 0, u, 0)).toBe(false);
    expect(supports.interval(0, 1).bind(1).inverse([1], 0, u, 0)).toBe(false);
    expect(supports.lowerBounded(3).bind(1).inverse([2], 0, u, 0)).toBe(false);
  });
});

describe('ordered', () => {
  const t = supports.ordered().bind(4);
  const u = Float64Array.of(-1.2, 0.3, -2, 1.1);
  it('log-Jacobian equals log|det| of the numerical Jacobian', () => {
    expect(Math.abs(forwardOf(t, u).logJ - logAbsDet(numericalJacobian(t, u, 4)))).toBeLessThan(1e-7);
  });
  it('chain rule matches central differences', () => checkBackward(t, u, Float64Array.of(0.5, -1, 2, 0.25)));
  it('round trips to 1e-12 and refuses unordered input', () => {
    roundTripTheta(t, [-3, -2.9, 0, 40]);
    roundTripU(t, Array.from(u));
    expect(t.inverse([0, 1, 1, 2], 0, new Float64Array(4), 0)).toBe(false);
  });
});

describe('simplex (stick breaking)', () => {
  for (const n of [2, 3, 5]) {
    const t = supports.simplex().bind(n);
    const u = Float64Array.from({ length: n - 1 }, (_, k) => 0.8 * Math.sin(1.7 * k + 0.4) - 0.2 * k);
    it(`n = ${n}: sums to one, log-Jacobian over the first n − 1 elements`, () => {
      const { theta, logJ } = forwardOf(t, u);
      expect(Math.abs(theta.reduce((a, b) => a + b, 0) - 1)).toBeLessThan(1e-15 * n);
      // The density is over the first n − 1 coordinates, so the square Jacobian is
      // ∂(x₀ … x_{n−2}) / ∂u.
      expect(Math.abs(logJ - logAbsDet(numericalJacobian(t, u, n - 1)))).toBeLessThan(1e-7);
    });
    it(`n = ${n}: chain rule through all n elements matches central differences`, () => {
      checkBackward(t, u, Float64Array.from({ length: n }, (_, i) => 1 - 0.6 * i));
    });
    it(`n = ${n}: round trips to 1e-12`, () => {
      const x = Array.from({ length: n }, (_, i) => i + 1);
      const s = x.reduce((a, b) => a + b, 0);
      roundTripTheta(t, x.map((v) => v / s));
      roundTripU(t, Array.from(u));
    });
  }
  it('u = 0 maps to the centre of the simplex', () => {
    const { theta } = forwardOf(supports.simplex().bind(4), [0, 0, 0]);
    for (const v of theta) expect(Math.abs(v - 0.25)).toBeLessThan(1e-15);
  });
});

describe('angle (2-D point with a log-normal radius)', () => {
  const s = 0.25;
  const t = supports.angle().bind(1);
  it('the term is ln g(r) − ln r: the log-normal radius density times the polar Jacobian', () => {
    // Augment θ with r: (a, b) → (θ, r) is a bijection whose Jacobian determinant is 1/r
    // (polar coordinates, common practice). Numerically differentiate it and compare
    // ln g(r) + ln|det ∂(θ, r)/∂(a, b)| with the transform's term.
    for (const [a, b] of [[0.9, 0.3], [-0.4, -1.3], [2.5, -0.1]]) {
      const h = 1e-6;
      const polar = (x: number, y: number): [number, number] => [forwardOf(t, [x, y]).theta[0], Math.hypot(x, y)];
      const J = [0, 1].map(() => [0, 0]);
      for (let k = 0; k < 2; k++) {
        const up = [a, b];
        const dn = [a, b];
        up[k] += h;
        dn[k] -= h;
        const pu = polar(up[0], up[1]);
        const pd = polar(dn[0], dn[1]);
        J[0][k] = (pu[0] - pd[0]) / (2 * h);
        J[1][k] = (pu[1] - pd[1]) / (2 * h);
      }
      const r = Math.hypot(a, b);
      const logG = -Math.log(r * s * Math.sqrt(2 * Math.PI)) - (Math.log(r) ** 2) / (2 * s * s);
      const { theta, logJ } = forwardOf(t, [a, b]);
      expect(Math.abs(theta[0] - Math.atan2(b, a))).toBeLessThan(1e-15);
      expect(Math.abs(logJ - (logG + logAbsDet(J)))).toBeLessThan(1e-7);
    }
  });
  it('exp(term) integrates to 2π over the plane, so a prior p(θ) is the exact marginal', () => {
    // Midpoint rule on [−6, 6]²; the density is smooth and negligible at the edges.
    const h = 0.004;
    let sum = 0;
    const u = new Float64Array(2);
    const th = new Float64Array(1);
    for (let a = -6 + h / 2; a < 6; a += h) {
      for (let b = -6 + h / 2; b < 6; b += h) {
        u[0] = a;
        u[1] = b;
        sum += Math.exp(t.forward(u, 0, th, 0));
      }
    }
    expect(Math.abs(sum * h * h - 2 * Math.PI)).toBeLessThan(1e-6);
  });
  it('chain rule matches central differences (two angles)', () => {
    checkBackward(supports.angle().bind(2), Float64Array.of(0.7, -0.2, -1.1, 0.9), Float64Array.of(1.5, -0.5));
    checkBackward(supports.angle({ radialScale: 0.6 }).bind(1), Float64Array.of(-0.3, 0.45), Float64Array.of(2));
  });
  it('θ → (cos θ, sin θ) → θ round trips to 1e-12 over (−π, π]', () => {
    roundTripTheta(supports.angle().bind(5), [-3.14159, -1, 0, 2.5, Math.PI]);
  });
});

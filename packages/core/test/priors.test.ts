import { describe, expect, it } from 'vitest';
import { createRandomStream } from '../src/random/index.js';
import { priors, type ScalarPrior } from '../src/model/index.js';
import { erfc, logNormalCdf, normalCdf } from '../src/model/math/normalCdf.js';
import { logGamma } from '../src/model/math/logGamma.js';
import { sampleStandardTruncated } from '../src/model/priors/truncatedNormal.js';

/**
 * Double-exponential quadrature (Takahasi & Mori 1974, Publ. RIMS 9, 721): tanh-sinh
 * on [a, b], exp-sinh on [a, ∞), sinh-sinh on (−∞, ∞). Handles end-point singularities
 * (beta(½, ½), gamma(½)) and algebraic tails (Cauchy). Step h in the transformed variable.
 */
function integrate(f: (x: number) => number, a: number, b: number, h = 1 / 128): number {
  let sum = 0;
  for (let t = -6; t <= 6; t += h) {
    const s = 0.5 * Math.PI * Math.sinh(t);
    const ds = 0.5 * Math.PI * Math.cosh(t);
    let x: number;
    let w: number;
    if (Number.isFinite(a) && Number.isFinite(b)) {
      // x = c + d tanh(s); distances to the ends formed directly to keep precision.
      const d = 0.5 * (b - a);
      const e = Math.exp(-2 * Math.abs(s));
      const toEnd = (2 * d * e) / (1 + e);
      x = s < 0 ? a + toEnd : b - toEnd;
      const sech = 1 / Math.cosh(s);
      w = d * sech * sech * ds;
    } else if (Number.isFinite(a)) {
      const e = Math.exp(s);
      x = a + e;
      w = e * ds;
    } else {
      x = Math.sinh(s);
      w = Math.cosh(s) * ds;
    }
    if (!Number.isFinite(x) || !Number.isFinite(w) || w === 0) continue;
    if (x <= a || x >= b) continue;
    const v = f(x);
    if (Number.isFinite(v)) sum += v * w;
  }
  return sum * h;
}

interface Case {
  readonly prior: ScalarPrior;
  /** Closed-form density, written out independently of the library. */
  readonly pdf: (x: number) => number;
  readonly source: string;
  readonly points: readonly number[];
  /** Analytic mean and variance, when finite. */
  readonly mean?: number;
  readonly variance?: number;
}

const SQ2PI = Math.sqrt(2 * Math.PI);
const phi = (z: number): number => Math.exp(-0.5 * z * z) / SQ2PI;

// Truncated normal on [−1, 2], mean 0.5, sd 1.5: moments from Johnson, Kotz &
// Balakrishnan (1994), Continuous Univariate Distributions vol. 1, eqs. 13.134–13.135
// (from memory): E = μ + σ (φ(α) − φ(β))/Z, Var = σ² [1 + (αφ(α) − βφ(β))/Z − ((φ(α) − φ(β))/Z)²].
const tn = { m: 0.5, s: 1.5, lo: -1, hi: 2 };
const tnA = (tn.lo - tn.m) / tn.s;
const tnB = (tn.hi - tn.m) / tn.s;
const tnZ = normalCdf(tnB) - normalCdf(tnA);
const tnRatio = (phi(tnA) - phi(tnB)) / tnZ;

const cases: Case[] = [
  {
    prior: priors.normal(1, 2),
    pdf: (x) => Math.exp(-((x - 1) ** 2) / 8) / (2 * SQ2PI),
    source: 'normal density, common practice',
    points: [-3, 1, 2.5],
    mean: 1,
    variance: 4,
  },
  {
    prior: priors.halfNormal(2),
    pdf: (x) => (2 * Math.exp(-(x * x) / 8)) / (2 * SQ2PI),
    source: 'half-normal: twice the N(0, σ²) density on x ≥ 0; mean σ√(2/π), variance σ²(1 − 2/π) (common practice)',
    points: [0, 0.7, 5],
    mean: 2 * Math.sqrt(2 / Math.PI),
    variance: 4 * (1 - 2 / Math.PI),
  },
  {
    prior: priors.studentT(3, 0, 1),
    pdf: (x) => (6 * Math.sqrt(3)) / (Math.PI * (3 + x * x) ** 2),
    source: 't with 3 dof: 6√3 / (π (3 + x²)²), from the general form with Γ(2) = 1, Γ(3/2) = √π/2 (common practice)',
    points: [-2, 0, 4],
    mean: 0,
  },
  {
    prior: priors.studentT(6, -1, 0.5),
    pdf: (x) => {
      // Γ(7/2)/Γ(3) = (15/8)√π / 2; density (1/s) Γ(7/2)/(Γ(3)√(6π)) (1 + z²/6)^(−7/2).
      const z = (x + 1) / 0.5;
      return ((15 / 16) * Math.sqrt(Math.PI)) / (Math.sqrt(6 * Math.PI) * 0.5) * (1 + (z * z) / 6) ** -3.5;
    },
    source: 'Student-t density with Γ(7/2) = 15√π/8; variance s² ν/(ν − 2) (common practice)',
    points: [-1, 0, -3],
    mean: -1,
    variance: 0.25 * (6 / 4),
  },
  {
    prior: priors.cauchy(2, 3),
    pdf: (x) => 1 / (Math.PI * 3 * (1 + ((x - 2) / 3) ** 2)),
    source: 'Cauchy density, common practice',
    points: [-10, 2, 7],
  },
  {
    prior: priors.halfCauchy(1.5),
    pdf: (x) => 2 / (Math.PI * 1.5 * (1 + (x / 1.5) ** 2)),
    source: 'half-Cauchy: twice the Cauchy(0, s) density on x ≥ 0 (common practice)',
    points: [0, 1, 30],
  },
  {
    prior: priors.uniform(-2, 6),
    pdf: () => 1 / 8,
    source: 'uniform: mean (a + b)/2, variance (b − a)²/12 (common practice)',
    points: [-2, 0, 5.9],
    mean: 2,
    variance: 64 / 12,
  },
  {
    prior: priors.logUniform(0.1, 100),
    pdf: (x) => 1 / (x * Math.log(1000)),
    source: 'log-uniform 1/(x ln(b/a)); mean (b − a)/ln(b/a), E[x²] = (b² − a²)/(2 ln(b/a)) by direct integration',
    points: [0.1, 3, 99],
    mean: 99.9 / Math.log(1000),
    variance: (100 * 100 - 0.01) / (2 * Math.log(1000)) - (99.9 / Math.log(1000)) ** 2,
  },
  {
    prior: priors.logNormal(0.3, 0.6),
    pdf: (x) => Math.exp(-((Math.log(x) - 0.3) ** 2) / (2 * 0.36)) / (x * 0.6 * SQ2PI),
    source: 'log-normal: mean exp(μ + σ²/2), variance (e^{σ²} − 1) e^{2μ + σ²} (common practice)',
    points: [0.2, 1, 6],
    mean: Math.exp(0.3 + 0.18),
    variance: (Math.exp(0.36) - 1) * Math.exp(0.6 + 0.36),
  },
  {
    prior: priors.exponential(2.5),
    pdf: (x) => 2.5 * Math.exp(-2.5 * x),
    source: 'exponential: mean 1/λ, variance 1/λ² (common practice)',
    points: [0, 0.4, 3],
    mean: 0.4,
    variance: 0.16,
  },
  {
    prior: priors.gamma(3, 2),
    pdf: (x) => 4 * x * x * Math.exp(-2 * x),
    source: 'gamma(α = 3, rate β = 2): β^α/Γ(α) = 8/2; mean α/β, variance α/β² (common practice)',
    points: [0.1, 1.5, 6],
    mean: 1.5,
    variance: 0.75,
  },
  {
    prior: priors.gamma(0.5, 1),
    pdf: (x) => Math.exp(-x) / Math.sqrt(Math.PI * x),
    source: 'gamma(½, 1) with Γ(½) = √π (common practice)',
    points: [1e-4, 0.5, 4],
    mean: 0.5,
    variance: 0.5,
  },
  {
    prior: priors.inverseGamma(4, 2),
    pdf: (x) => ((16 / 6) * Math.exp(-2 / x)) / x ** 5,
    source: 'inverse-gamma(α = 4, scale 2): β^α/Γ(α) = 16/6; mean β/(α − 1), variance β²/((α − 1)²(α − 2)) (common practice)',
    points: [0.2, 0.7, 5],
    mean: 2 / 3,
    variance: 4 / (9 * 2),
  },
  {
    prior: priors.beta(2, 3),
    pdf: (x) => 12 * x * (1 - x) ** 2,
    source: 'beta(2, 3), 1/B(2, 3) = 4!/(1! 2!) = 12; mean a/(a + b), variance ab/((a + b)²(a + b + 1)) (common practice)',
    points: [0.05, 0.4, 0.9],
    mean: 0.4,
    variance: 6 / (25 * 6),
  },
  {
    prior: priors.beta(0.5, 0.5),
    pdf: (x) => 1 / (Math.PI * Math.sqrt(x * (1 - x))),
    source: 'arcsine law beta(½, ½), B(½, ½) = π (common practice)',
    points: [0.01, 0.5, 0.97],
    mean: 0.5,
    variance: 1 / 8,
  },
  {
    prior: priors.truncatedNormal(tn.m, tn.s, tn.lo, tn.hi),
    pdf: (x) => phi((x - tn.m) / tn.s) / (tn.s * tnZ),
    source: 'truncated normal, Johnson, Kotz & Balakrishnan (1994) ch. 13 (from memory)',
    points: [-1, 0.5, 1.9],
    mean: tn.m + tn.s * tnRatio,
    variance: tn.s * tn.s * (1 + (tnA * phi(tnA) - tnB * phi(tnB)) / tnZ - tnRatio * tnRatio),
  },
  {
    prior: priors.truncatedNormal(0, 1, 0, Infinity),
    pdf: (x) => 2 * phi(x),
    source: 'N(0, 1) truncated to [0, ∞) is the half-normal (common practice)',
    points: [0, 1, 3],
    mean: Math.sqrt(2 / Math.PI),
    variance: 1 - 2 / Math.PI,
  },
];

describe('prior log-densities', () => {
  for (const c of cases) {
    it(`${c.prior.description}: matches the closed form (${c.source})`, () => {
      for (const x of c.points) {
        const ref = Math.log(c.pdf(x));
        expect(Math.abs(c.prior.logDensity(x) - ref)).toBeLessThan(1e-12 * Math.max(1, Math.abs(ref)));
      }
    });
    it(`${c.prior.description}: derivative matches central differences of the log-density`, () => {
      for (const x0 of c.points) {
        // Stay inside the support for points on its edge.
        const x = x0 === c.prior.lower ? x0 + 1e-3 : x0 === c.prior.upper ? x0 - 1e-3 : x0;
        const h = 1e-6 * Math.max(1e-3, Math.abs(x));
        const fd = (c.prior.logDensity(x + h) - c.prior.logDensity(x - h)) / (2 * h);
        expect(Math.abs(c.prior.logDensityDerivative(x) - fd)).toBeLessThan(1e-6 * Math.max(1, Math.abs(fd)));
      }
    });
    it(`${c.prior.description}: integrates to 1 (double-exponential quadrature)`, () => {
      const total = integrate((x) => Math.exp(c.prior.logDensity(x)), c.prior.lower, c.prior.upper);
      expect(Math.abs(total - 1)).toBeLessThan(1e-8);
    });
    if (c.mean !== undefined && c.variance !== undefined) {
      it(`${c.prior.description}: analytic mean and variance agree with quadrature`, () => {
        const p = (x: number): number => Math.exp(c.prior.logDensity(x));
        const m = integrate((x) => x * p(x), c.prior.lower, c.prior.upper);
        const v = integrate((x) => (x - m) * (x - m) * p(x), c.prior.lower, c.prior.upper);
        expect(Math.abs(m - c.mean!)).toBeLessThan(1e-7 * Math.max(1, Math.abs(c.mean!)));
        expect(Math.abs(v - c.variance!)).toBeLessThan(1e-6 * c.variance!);
      });
    }
  }
  it('dirichlet([2, 3, 4]) matches Γ(9)/(Γ(2)Γ(3)Γ(4)) x y² z³ = 3360 x y² z³ (common practice)', () => {
    const d = priors.dirichlet([2, 3, 4]);
    const x = Float64Array.of(0.2, 0.3, 0.5);
    expect(Math.abs(d.logDensity(x, 0, 3) - Math.log(3360 * 0.2 * 0.09 * 0.125))).toBeLessThan(1e-12);
    const g = new Float64Array(3);
    d.addGradient(x, 0, 3, g, 0);
    expect(Array.from(g)).toEqual([1 / 0.2, 2 / 0.3, 3 / 0.5]);
  });
  it('flat() is improper: zero log-density and no sampler', () => {
    expect(priors.flat().logDensity(123)).toBe(0);
    expect(priors.flat().sample).toBeUndefined();
  });
  it('custom prior: given derivative is used; the finite-difference fallback is accurate to 1e-8', () => {
    const logDensity = (x: number): number => -Math.log(Math.PI) - Math.log1p(x * x);
    const exact = priors.custom({ logDensity, derivative: (x) => (-2 * x) / (1 + x * x) });
    const fallback = priors.custom({ logDensity });
    for (const x of [-3, 0.2, 10]) {
      expect(exact.logDensityDerivative(x)).toBe((-2 * x) / (1 + x * x));
      expect(Math.abs(fallback.logDensityDerivative(x) - (-2 * x) / (1 + x * x))).toBeLessThan(1e-8);
    }
    expect(Math.abs(integrate((x) => Math.exp(fallback.logDensity(x)), -Infinity, Infinity) - 1)).toBeLessThan(1e-8);
  });
});

describe('special functions behind the priors', () => {
  it('erfc and ln Φ match tabulated values and tail asymptotics', () => {
    // erfc(1) = 0.157299207050285, erfc(3) = 2.20904969985854e-5 (Abramowitz & Stegun
    // 1964, Table 7.1; from memory).
    expect(Math.abs(erfc(1) / 0.157299207050285 - 1)).toBeLessThan(1e-13);
    expect(Math.abs(erfc(3) / 2.20904969985854e-5 - 1)).toBeLessThan(1e-12);
    // Mills-ratio series Φ(−z) ≈ φ(z)/z · (1 − 1/z² + 3/z⁴ − 15/z⁶ + 105/z⁸) (A&S 26.2.12).
    const z = 30;
    const series = -0.5 * z * z - Math.log(z * SQ2PI) + Math.log(1 - 1 / z ** 2 + 3 / z ** 4 - 15 / z ** 6 + 105 / z ** 8);
    expect(Math.abs(logNormalCdf(-z) - series)).toBeLessThan(1e-12 * Math.abs(series));
  });
  it('ln Γ matches factorials and Γ(½) = √π (common practice)', () => {
    expect(Math.abs(logGamma(0.5) - 0.5 * Math.log(Math.PI))).toBeLessThan(1e-15);
    expect(Math.abs(logGamma(11) - Math.log(3628800))).toBeLessThan(1e-14);
    expect(Math.abs(logGamma(171) - [...Array(170).keys()].reduce((s, k) => s + Math.log(k + 1), 0))).toBeLessThan(1e-11);
  });
  it('truncated-normal inversion reproduces the requested probability level far in a tail', () => {
    for (const [a, b] of [[8, Infinity], [-Infinity, -12], [5, 5.1], [-2, 3]] as const) {
      for (const u of [0.01, 0.5, 0.99]) {
        const x = sampleStandardTruncated(a, b, u);
        expect(x).toBeGreaterThanOrEqual(a);
        expect(x).toBeLessThanOrEqual(b);
        // Level of x: (Φ(x) − Φ(a))/(Φ(b) − Φ(a)), in the tail where it is exact.
        const level =
          a > 0
            ? 1 - (erfc(x / Math.SQRT2) - erfc(b / Math.SQRT2)) / (erfc(a / Math.SQRT2) - erfc(b / Math.SQRT2))
            : (normalCdf(x) - normalCdf(a)) / (normalCdf(b) - normalCdf(a));
        expect(Math.abs(level - u)).toBeLessThan(1e-9);
      }
    }
  });
});

describe('direct prior sampling (explicit random source)', () => {
  // Independent draws: the standard error of the mean is sd/√n and of the variance
  // √((μ₄ − σ⁴)/n), estimated from the draws; tolerance 4 standard errors (fixed seed).
  const n = 40_000;
  for (const c of cases) {
    if (c.mean === undefined || c.variance === undefined || !c.prior.sample) continue;
    it(`${c.prior.description}: mean and variance within 4 standard errors`, () => {
      const source = createRandomStream(`prior draws ${c.prior.description}`);
      const xs = new Float64Array(n);
      for (let i = 0; i < n; i++) xs[i] = c.prior.sample!(source);
      let m = 0;
      for (const x of xs) m += x / n;
      let m2 = 0;
      let m4 = 0;
      for (const x of xs) {
        const d = (x - m) ** 2;
        m2 += d / n;
        m4 += (d * d) / n;
      }
      let outside = 0;
      for (const x of xs) if (!(c.prior.logDensity(x) > -Infinity)) outside++;
      expect(outside).toBe(0);
      expect(Math.abs(m - c.mean!)).toBeLessThan(4 * Math.sqrt(m2 / n));
      expect(Math.abs(m2 - c.variance!)).toBeLessThan(4 * Math.sqrt((m4 - m2 * m2) / n));
    });
  }
  it('Cauchy and half-Cauchy draws: half of them within one scale of the centre (binomial, 4 SE)', () => {
    const source = createRandomStream('cauchy draws');
    const c = priors.cauchy(2, 3);
    const h = priors.halfCauchy(1.5);
    let inC = 0;
    let inH = 0;
    for (let i = 0; i < n; i++) {
      if (Math.abs(c.sample!(source) - 2) < 3) inC++;
      if (h.sample!(source) < 1.5) inH++;
    }
    const se = Math.sqrt(0.25 / n);
    expect(Math.abs(inC / n - 0.5)).toBeLessThan(4 * se);
    expect(Math.abs(inH / n - 0.5)).toBeLessThan(4 * se);
  });
  it('dirichlet([2, 3, 4]) draws: component means α/Σα within 4 standard errors', () => {
    const source = createRandomStream('dirichlet draws');
    const d = priors.dirichlet([2, 3, 4]);
    const out = new Float64Array(3);
    const sums = [0, 0, 0];
    for (let i = 0; i < n; i++) {
      d.sample!(source, out, 0, 3);
      for (let k = 0; k < 3; k++) sums[k] += out[k];
    }
    [2, 3, 4].forEach((a, k) => {
      const mean = a / 9;
      const sd = Math.sqrt((mean * (1 - mean)) / 10); // Var = m(1 − m)/(Σα + 1) (common practice)
      expect(Math.abs(sums[k] / n - mean)).toBeLessThan(4 * sd / Math.sqrt(n));
    });
  });
});

describe('prior argument validation', () => {
  it('names the argument and the expectation', () => {
    expect(() => priors.normal(0, -1)).toThrow(/normal\.sd = -1: expected a finite number > 0/);
    expect(() => priors.uniform(3, 1)).toThrow(/uniform\.upper = 1: expected a number greater than uniform\.lower = 3/);
    expect(() => priors.logUniform(0, 1)).toThrow(/logUniform\.lower = 0/);
    expect(() => priors.gamma(NaN, 1)).toThrow(/gamma\.shape = NaN/);
    expect(() => priors.truncatedNormal(0, 1, 2, 2)).toThrow(/truncatedNormal\.upper/);
    expect(() => priors.dirichlet([1, -2])).toThrow(/dirichlet\.concentration\[1\] = -2/);
    expect(() => priors.custom({ logDensity: 3 as unknown as (x: number) => number })).toThrow(/customPrior\.logDensity/);
  });
});

import type { Target } from '../../src/target.js';
import { createRandomStream } from '../../src/random/index.js';

/** Standard normal in `dim` dimensions: log p = −½|x|². */
export function standardNormal(dim: number): Target {
  return {
    dim,
    logDensityGrad(x, g) {
      let s = 0;
      for (let i = 0; i < dim; i++) {
        s += x[i] * x[i];
        g[i] = -x[i];
      }
      return -0.5 * s;
    },
  };
}

/** Gaussian with zero mean and the given precision matrix (dim × dim, row-major). */
export function gaussianWithPrecision(precision: Float64Array, dim: number): Target {
  return {
    dim,
    logDensityGrad(x, g) {
      let s = 0;
      for (let i = 0; i < dim; i++) {
        let gi = 0;
        const row = i * dim;
        for (let j = 0; j < dim; j++) gi -= precision[row + j] * x[j];
        g[i] = gi;
        s += x[i] * gi;
      }
      return 0.5 * s;
    },
  };
}

/** Inverse of a symmetric positive-definite matrix by Gauss–Jordan elimination. */
export function invertSymmetric(a: Float64Array, n: number): Float64Array {
  const m = new Float64Array(n * 2 * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) m[i * 2 * n + j] = a[i * n + j];
    m[i * 2 * n + n + i] = 1;
  }
  for (let c = 0; c < n; c++) {
    let pivot = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r * 2 * n + c]) > Math.abs(m[pivot * 2 * n + c])) pivot = r;
    if (pivot !== c) {
      for (let k = 0; k < 2 * n; k++) {
        const t = m[c * 2 * n + k];
        m[c * 2 * n + k] = m[pivot * 2 * n + k];
        m[pivot * 2 * n + k] = t;
      }
    }
    const d = m[c * 2 * n + c];
    for (let k = 0; k < 2 * n; k++) m[c * 2 * n + k] /= d;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r * 2 * n + c];
      if (f === 0) continue;
      for (let k = 0; k < 2 * n; k++) m[r * 2 * n + k] -= f * m[c * 2 * n + k];
    }
  }
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) out[i * n + j] = m[i * 2 * n + n + j];
  return out;
}

/** A random orthogonal matrix (Gram–Schmidt on Gaussian columns) from a fixed seed. */
export function randomOrthogonal(n: number, seedText: string): Float64Array {
  const rng = createRandomStream(seedText);
  const q = new Float64Array(n * n); // columns q[:, k] stored at q[i * n + k]
  for (let k = 0; k < n; k++) {
    const v = new Float64Array(n);
    for (let i = 0; i < n; i++) v[i] = rng.normal();
    for (let pass = 0; pass < 2; pass++) {
      for (let j = 0; j < k; j++) {
        let dot = 0;
        for (let i = 0; i < n; i++) dot += q[i * n + j] * v[i];
        for (let i = 0; i < n; i++) v[i] -= dot * q[i * n + j];
      }
    }
    let norm = 0;
    for (let i = 0; i < n; i++) norm += v[i] * v[i];
    norm = Math.sqrt(norm);
    for (let i = 0; i < n; i++) q[i * n + k] = v[i] / norm;
  }
  return q;
}

/** Q diag(λ) Qᵀ for an orthogonal Q (columns are eigenvectors). */
export function fromEigen(q: Float64Array, lambda: ArrayLike<number>, n: number): Float64Array {
  const out = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      let s = 0;
      for (let k = 0; k < n; k++) s += q[i * n + k] * lambda[k] * q[j * n + k];
      out[i * n + j] = s;
    }
  }
  return out;
}

/** A 2-D Gaussian with unit variances and correlation `rho`: covariance and precision. */
export function correlatedPair(rho: number): { covariance: Float64Array; target: Target } {
  const covariance = Float64Array.from([1, rho, rho, 1]);
  return { covariance, target: gaussianWithPrecision(invertSymmetric(covariance, 2), 2) };
}

/**
 * A `dim`-D zero-mean Gaussian with a randomly rotated covariance whose eigenvalues are
 * log-spaced from 1e−2 to 1e2 (condition number 1e4).
 */
export function illConditionedGaussian(dim: number): {
  covariance: Float64Array;
  eigenvectors: Float64Array;
  eigenvalues: Float64Array;
  target: Target;
} {
  const eigenvalues = new Float64Array(dim);
  for (let k = 0; k < dim; k++) eigenvalues[k] = 10 ** (-2 + (4 * k) / (dim - 1));
  const eigenvectors = randomOrthogonal(dim, `rotation ${dim}`);
  const covariance = fromEigen(eigenvectors, eigenvalues, dim);
  const precision = fromEigen(eigenvectors, eigenvalues.map((l) => 1 / l), dim);
  return { covariance, eigenvectors, eigenvalues, target: gaussianWithPrecision(precision, dim) };
}

/**
 * Neal's (2003, Annals of Statistics 31, 705, sec. 8) funnel: v ~ N(0, 3²) and
 * x_i | v ~ N(0, e^v) for i = 1 … dim − 1. Centred: coordinates (v, x).
 */
export function centredFunnel(dim = 10): Target {
  return {
    dim,
    logDensityGrad(z, g) {
      const v = z[0];
      const ev = Math.exp(-v);
      let lp = -(v * v) / 18;
      let gv = -v / 9;
      for (let i = 1; i < dim; i++) {
        const x = z[i];
        lp += -0.5 * x * x * ev - 0.5 * v;
        gv += 0.5 * x * x * ev - 0.5;
        g[i] = -x * ev;
      }
      g[0] = gv;
      return lp;
    },
  };
}

/** The funnel's non-centred form: v = 3ν, x_i = e^{v/2} ξ_i with ν, ξ_i ~ N(0, 1). */
export function nonCentredFunnel(dim = 10): Target {
  return standardNormal(dim);
}

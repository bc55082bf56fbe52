import type { RandomStream } from '../random/index.js';
import { choleskyLower } from './cholesky.js';

/**
 * A Euclidean metric, stored by its inverse mass matrix M⁻¹ (the sampler's running
 * estimate of the posterior covariance in the target's coordinates).
 * - `unit`: M = I.
 * - `diagonal`: M⁻¹ = diag(inverseMass).
 * - `dense`: M⁻¹ = inverseMass (dim × dim, row-major), with its lower Cholesky factor.
 */
export type Metric =
  | { readonly kind: 'unit'; readonly dim: number }
  | { readonly kind: 'diagonal'; readonly dim: number; readonly inverseMass: Float64Array }
  | {
      readonly kind: 'dense';
      readonly dim: number;
      readonly inverseMass: Float64Array;
      readonly choleskyLower: Float64Array;
    };

/** Metric families a chain can adapt. */
export type MetricKind = Metric['kind'];

/** The identity metric of the given kind (a starting point for adaptation). */
export function identityMetric(kind: MetricKind, dim: number): Metric {
  if (kind === 'unit') return { kind, dim };
  if (kind === 'diagonal') return { kind, dim, inverseMass: new Float64Array(dim).fill(1) };
  const inverseMass = new Float64Array(dim * dim);
  for (let i = 0; i < dim; i++) inverseMass[i * dim + i] = 1;
  return { kind, dim, inverseMass, choleskyLower: inverseMass.slice() };
}

/** A diagonal metric with the given inverse mass (variances). Throws on a non-positive entry. */
export function diagonalMetric(inverseMass: ArrayLike<number>): Metric {
  const m = Float64Array.from(inverseMass);
  for (let i = 0; i < m.length; i++) {
    if (!(m[i] > 0) || !Number.isFinite(m[i])) {
      throw new RangeError(`inverseMass[${i}] = ${m[i]}: expected a finite number > 0`);
    }
  }
  return { kind: 'diagonal', dim: m.length, inverseMass: m };
}

/**
 * A dense metric with the given inverse mass (covariance, dim × dim row-major).
 * Throws if it is not symmetric positive definite.
 */
export function denseMetric(inverseMass: ArrayLike<number>, dim: number): Metric {
  const m = Float64Array.from(inverseMass);
  if (m.length !== dim * dim) {
    throw new RangeError(`inverseMass has length ${m.length}: expected dim * dim = ${dim * dim}`);
  }
  for (let i = 0; i < dim; i++) {
    for (let j = 0; j < i; j++) {
      const a = m[i * dim + j];
      const b = m[j * dim + i];
      if (Math.abs(a - b) > 1e-12 * Math.max(Math.abs(a), Math.abs(b), 1e-300)) {
        throw new RangeError(`inverseMass is not symmetric at (${i}, ${j}): ${a} vs ${b}`);
      }
    }
  }
  const l = choleskyLower(m, dim);
  if (l === null) throw new RangeError('inverseMass is not positive definite');
  return { kind: 'dense', dim, inverseMass: m, choleskyLower: l };
}

/** out = M⁻¹ x. `out` must not alias `x` for a dense metric. */
export function applyInverseMass(metric: Metric, x: Float64Array, out: Float64Array): void {
  const n = metric.dim;
  if (metric.kind === 'unit') {
    for (let i = 0; i < n; i++) out[i] = x[i];
  } else if (metric.kind === 'diagonal') {
    const m = metric.inverseMass;
    for (let i = 0; i < n; i++) out[i] = m[i] * x[i];
  } else {
    const m = metric.inverseMass;
    for (let i = 0; i < n; i++) {
      let s = 0;
      const row = i * n;
      for (let j = 0; j < n; j++) s += m[row + j] * x[j];
      out[i] = s;
    }
  }
}

/**
 * Draws a momentum p ~ N(0, M) into `p` and writes its velocity M⁻¹ p into `velocity`.
 * Dense: with M⁻¹ = L Lᵀ and z ~ N(0, I), p = L⁻ᵀ z and M⁻¹ p = L z.
 */
export function drawMomentum(
  metric: Metric,
  rng: RandomStream,
  p: Float64Array,
  velocity: Float64Array,
): void {
  const n = metric.dim;
  if (metric.kind === 'unit') {
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      p[i] = z;
      velocity[i] = z;
    }
  } else if (metric.kind === 'diagonal') {
    const m = metric.inverseMass;
    for (let i = 0; i < n; i++) {
      const z = rng.normal();
      const s = Math.sqrt(m[i]);
      p[i] = z / s;
      velocity[i] = z * s;
    }
  } else {
    const l = metric.choleskyLower;
    // z in `velocity` as scratch first.
    for (let i = 0; i < n; i++) velocity[i] = rng.normal();
    // Back substitution Lᵀ p = z.
    for (let i = n - 1; i >= 0; i--) {
      let s = velocity[i];
      for (let k = i + 1; k < n; k++) s -= l[k * n + i] * p[k];
      p[i] = s / l[i * n + i];
    }
    // velocity = L z, computed from the bottom row up so z is read before being overwritten.
    for (let i = n - 1; i >= 0; i--) {
      let s = 0;
      const row = i * n;
      for (let k = 0; k <= i; k++) s += l[row + k] * velocity[k];
      velocity[i] = s;
    }
  }
}

/** Kinetic energy ½ pᵀ M⁻¹ p from a momentum and its velocity M⁻¹ p. */
export function kineticEnergy(p: Float64Array, velocity: Float64Array): number {
  let s = 0;
  for (let i = 0; i < p.length; i++) s += p[i] * velocity[i];
  return 0.5 * s;
}

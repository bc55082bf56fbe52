import { choleskyLower } from './cholesky.js';
import type { Metric, MetricKind } from './metric.js';

/**
 * The metric whose inverse mass is `covariance` (variances for the diagonal kind,
 * dim × dim row-major for the dense kind). Returns null if a dense covariance is not
 * numerically positive definite or a variance is not a finite positive number.
 */
export function metricFromCovariance(
  kind: Exclude<MetricKind, 'unit'>,
  covariance: Float64Array,
  dim: number,
): Metric | null {
  if (kind === 'diagonal') {
    for (let i = 0; i < dim; i++) {
      if (!(covariance[i] > 0) || !Number.isFinite(covariance[i])) return null;
    }
    return { kind, dim, inverseMass: covariance };
  }
  const l = choleskyLower(covariance, dim);
  if (l === null) return null;
  for (let i = 0; i < l.length; i++) if (!Number.isFinite(l[i])) return null;
  return { kind, dim, inverseMass: covariance, choleskyLower: l };
}

/**
 * A prior on the eccentricity vector (h, k) = (√e cos ω, √e sin ω) built from a prior
 * on e alone, with ω uniform on the circle and independent of e.
 *
 * The map (e, ω) → (h, k) has |det ∂(h, k)/∂(e, ω)| = 1/2 (the inverse of the
 * determinant 2 of `orbit/eccentricityForms.ts`), so a density p(e) · 1/(2π) over
 * (e, ω) is the density p(e) · 1/(2π) · 2 = p(e)/π over (h, k), evaluated at
 * e = h² + k². Its gradient is (p'(e)/p(e)) · (2h, 2k). With p uniform on [0, 1) this
 * is the uniform density 1/π on the unit disk.
 */
import { priors, type ScalarPrior, type VectorPrior } from '@apsis/core';

const LOG_PI = Math.log(Math.PI);

/**
 * The vector prior on (h, k) whose marginal for e = h² + k² is `eccentricity` (a prior
 * on [0, 1), default uniform) and whose ω is uniform.
 */
export function eccentricityDiskPrior(eccentricity: ScalarPrior = priors.uniform(0, 1)): VectorPrior {
  const p = eccentricity;
  const sample = p.sample;
  return {
    kind: 'eccentricityDisk',
    description: `eccentricity ~ ${p.description}, omega uniform`,
    // The largest eccentricity the prior allows: the disk support takes √upper as its radius.
    lower: 0,
    upper: Math.min(1, p.upper),
    proper: p.proper,
    supportKinds: ['unitDisk'],
    length: 2,
    logDensity(x, at) {
      const e = x[at] * x[at] + x[at + 1] * x[at + 1];
      if (!(e < 1)) return -Infinity;
      return p.logDensity(e) - LOG_PI;
    },
    addGradient(x, at, _n, g, gAt) {
      const h = x[at];
      const k = x[at + 1];
      const e = h * h + k * k;
      if (!(e < 1)) return;
      const d = p.logDensityDerivative(e);
      g[gAt] += 2 * h * d;
      g[gAt + 1] += 2 * k * d;
    },
    ...(sample
      ? {
          sample(source, out, at) {
            let e = sample(source);
            if (!(e < 1)) e = 1 - 1e-12;
            const w = Math.PI * (2 * source.uniform() - 1);
            const r = Math.sqrt(Math.max(0, e));
            out[at] = r * Math.cos(w);
            out[at + 1] = r * Math.sin(w);
          },
        }
      : {}),
  };
}

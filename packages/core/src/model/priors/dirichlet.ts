import { PriorArgumentError } from '../errors.js';
import { logGamma } from '../math/logGamma.js';
import { positiveArgument } from './arguments.js';
import type { VectorPrior } from './prior.js';
import { sampleStandardGamma } from './sampling.js';

/**
 * Dirichlet(concentration) on a simplex of n elements:
 * ln p = ln Γ(Σ αᵢ) − Σ ln Γ(αᵢ) + Σ (αᵢ − 1) ln xᵢ, with respect to Lebesgue measure
 * on the first n − 1 elements. A single number means the same αᵢ for every element
 * (1 is uniform on the simplex). Sampled as normalised Gamma(αᵢ) draws.
 */
export function dirichlet(concentration: number | readonly number[]): VectorPrior {
  const single = typeof concentration === 'number';
  let alphas: Float64Array | undefined;
  let alpha = 1;
  if (single) {
    alpha = positiveArgument('dirichlet.concentration', concentration);
  } else {
    if (!Array.isArray(concentration) || concentration.length < 2) {
      throw new PriorArgumentError('dirichlet.concentration', concentration, 'a number > 0 or an array of at least 2 numbers > 0');
    }
    alphas = Float64Array.from(concentration, (a, i) => positiveArgument(`dirichlet.concentration[${i}]`, a));
  }
  const fixed = alphas;
  const at = (i: number): number => (fixed ? fixed[i] : alpha);
  const normaliser = (n: number): number => {
    let sum = 0;
    let logs = 0;
    for (let i = 0; i < n; i++) {
      sum += at(i);
      logs += logGamma(at(i));
    }
    return logGamma(sum) - logs;
  };
  let cachedN = -1;
  let cachedC = 0;
  return {
    kind: 'dirichlet',
    description: fixed ? `dirichlet([${Array.from(fixed).join(', ')}])` : `dirichlet(${alpha})`,
    lower: 0,
    upper: 1,
    proper: true,
    supportKinds: ['simplex'],
    ...(fixed ? { length: fixed.length } : {}),
    logDensity(x, off, n) {
      if (n !== cachedN) {
        cachedN = n;
        cachedC = normaliser(n);
      }
      let lp = cachedC;
      for (let i = 0; i < n; i++) {
        const a = at(i);
        const xi = x[off + i];
        // An element rounded to 0 with α < 1 would give +∞; treat it as outside (see beta).
        if (xi === 0 && a < 1) return -Infinity;
        if (a !== 1) lp += (a - 1) * Math.log(xi);
      }
      return lp;
    },
    addGradient(x, off, n, g, gAt) {
      for (let i = 0; i < n; i++) g[gAt + i] += (at(i) - 1) / x[off + i];
    },
    sample(source, out, off, n) {
      let total = 0;
      for (let i = 0; i < n; i++) {
        const v = sampleStandardGamma(at(i), source);
        out[off + i] = v;
        total += v;
      }
      for (let i = 0; i < n; i++) out[off + i] /= total;
    },
  };
}

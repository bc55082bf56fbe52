import { describe, expect, it } from 'vitest';
import { createLightCurveKernel } from '../src/transit/lightCurve.js';
import { createLightCurveLikelihood } from '../src/transit/lightCurveLikelihood.js';

// The likelihood's residual pass runs in chunks of points and sums ln var_i as the
// logarithm of products over blocks whose length depends on the range of the
// variances. Checked here against the plain sum of Gaussian log densities, one
// logarithm per point, for variances from 1e-28 to 1e300 and lengths that are not
// multiples of the chunk or block size.

/** Park–Miller minimal standard generator, seeded (Park & Miller 1988, CACM 31, 1192). */
function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
}

const N = 2500;
const times = Float64Array.from({ length: N }, (_, i) => -5 + (10 * i) / N);
// Invented planet [P, tc, e, omega, a/R_*, b, k] and limb darkening.
const PLANET = [2.4, 0.3, 0.1, 0.8, 7.5, 0.3, 0.12, 0.4, 0.25];

describe('light-curve likelihood: chunked residual pass and blocked ln var sums', () => {
  const cases = [
    // Variances from 1e-28 to 1e300 (the smallest error still 50 ulps of the flux).
    { label: 'errors from 1e-14 to 1e150 (one logarithm per point)', error: (u: number) => 10 ** (164 * u - 14), jitter: 0 },
    { label: 'errors from 1e-6 to 1e-2, with jitter', error: (u: number) => 10 ** (4 * u - 6), jitter: 3e-4 },
    { label: 'equal errors of 1 and no jitter (ln var = 0)', error: () => 1, jitter: 0 },
  ];
  for (const c of cases) {
    it(c.label, () => {
      const u = lcg(31337);
      const errors = Float64Array.from(times, () => c.error(u()));
      const params = Float64Array.from([...PLANET, 1.0001, c.jitter, 0.2]);
      // The model from the kernel's flux, m = f0 (F + D)/(1 + D), and data scattered
      // about it by each point's error.
      const F = createLightCurveKernel({ times, planets: 1 }).flux(params.slice(0, 9));
      const model = Float64Array.from(F, (f) => (params[9] * (f + params[11])) / (1 + params[11]));
      const flux = Float64Array.from(model, (m, i) => m + errors[i] * (2 * u() - 1));
      const like = createLightCurveLikelihood({ times, flux, errors, planets: 1, dilution: true });
      const grad = new Float64Array(like.dim);
      const withGrad = like.logLikelihoodGrad(params, grad);
      // The likelihood's own model agrees with it; the direct sum below uses the former,
      // so that both see the same residuals.
      for (let i = 0; i < N; i++) expect(Math.abs(like.lastModel[i] - model[i])).toBeLessThan(3e-16 * model[i]);
      model.set(like.lastModel);
      const valueOnly = like.logLikelihood(params);
      let direct = 0;
      let size = 0;
      for (let i = 0; i < N; i++) {
        const v = errors[i] * errors[i] + c.jitter * c.jitter;
        const term = -0.5 * ((flux[i] - model[i]) ** 2 / v + Math.log(2 * Math.PI * v));
        direct += term;
        size += Math.abs(term);
      }
      expect(Math.abs(withGrad - direct)).toBeLessThan(1e-13 * size);
      expect(Math.abs(valueOnly - direct)).toBeLessThan(1e-13 * size);
      // The baseline's derivative from its definition, Σ (y_i − m_i)/var_i · m_i/f0.
      let dBase = 0;
      for (let i = 0; i < N; i++) dBase += ((flux[i] - model[i]) / (errors[i] ** 2 + c.jitter ** 2)) * (model[i] / params[9]);
      expect(Math.abs(grad[9] - dBase)).toBeLessThan(1e-12 * Math.max(1, Math.abs(dBase)));
    });
  }
});

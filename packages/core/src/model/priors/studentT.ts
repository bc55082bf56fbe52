import { logGamma } from '../math/logGamma.js';
import { finiteArgument, positiveArgument } from './arguments.js';
import type { ScalarPrior } from './prior.js';
import { sampleStandardGamma } from './sampling.js';

/**
 * Student-t(dof, location, scale): with z = (x − location)/scale,
 * ln p = ln Γ((ν+1)/2) − ln Γ(ν/2) − ½ ln(νπ) − ln scale − (ν+1)/2 · ln(1 + z²/ν).
 * Sampled as location + scale · Z / √(V/ν), V = 2 · Gamma(ν/2, 1) ~ χ²_ν.
 * @param dof degrees of freedom ν > 0
 * @param location centre, in the parameter's units
 * @param scale scale > 0, in the parameter's units
 */
export function studentT(dof: number, location: number, scale: number): ScalarPrior {
  const nu = positiveArgument('studentT.dof', dof);
  const m = finiteArgument('studentT.location', location);
  const s = positiveArgument('studentT.scale', scale);
  const c = logGamma((nu + 1) / 2) - logGamma(nu / 2) - 0.5 * Math.log(nu * Math.PI) - Math.log(s);
  const h = (nu + 1) / 2;
  return {
    kind: 'studentT',
    description: `studentT(${nu}, ${m}, ${s})`,
    lower: -Infinity,
    upper: Infinity,
    proper: true,
    circular: false,
    logDensity: (x) => {
      const z = (x - m) / s;
      return c - h * Math.log1p((z * z) / nu);
    },
    logDensityDerivative: (x) => {
      const z = (x - m) / s;
      return (-(nu + 1) * z) / (s * (nu + z * z));
    },
    sample: (source) => {
      const v = 2 * sampleStandardGamma(nu / 2, source);
      return m + (s * source.normal()) / Math.sqrt(v / nu);
    },
  };
}

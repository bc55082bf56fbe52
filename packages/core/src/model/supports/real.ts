import { elementwiseSupport } from './elementwise.js';
import type { Support } from './transform.js';

/** The whole real line; the identity map, log-Jacobian 0. */
export function real(): Support {
  return elementwiseSupport('real', 'real()', -Infinity, Infinity, {
    forward: (u) => u,
    inverse: (t) => t,
    logJacobian: () => 0,
    derivative: () => 1,
    logJacobianDerivative: () => 0,
    contains: (t) => Number.isFinite(t),
  }, true);
}

export * from './errors.js';
export {
  completeEllipticE,
  completeEllipticK,
  completeEllipticPi,
  generalCompleteEllipticIntegral,
} from './ellipticIntegrals.js';
export {
  FLUX_DK,
  FLUX_DU1,
  FLUX_DU2,
  FLUX_DZ,
  FLUX_PARTIALS_SIZE,
  FLUX_VALUE,
  quadraticTransitFlux,
  quadraticTransitFluxWithPartials,
} from './quadraticFlux.js';

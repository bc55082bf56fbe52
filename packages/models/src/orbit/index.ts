export * from './errors.js';
export * from './constants.js';
export * from './kepler.js';

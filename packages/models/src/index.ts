export * from './orbit/index.js';
export * from './transit/index.js';
export * from './builders/index.js';

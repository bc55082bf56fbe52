/**
 * A driver for profiling the NUTS kernels: one chain on a Gaussian for a few seconds.
 *   node --cpu-prof --cpu-prof-dir=/tmp/prof --conditions=source --import tsx bench/support/profileNuts.ts [cheap|rotated|rotated-dense] [seconds]
 * cheap: iid 100-D Gaussian, diagonal metric; rotated: 100-D Gaussian with condition number
 * 1e4 and dense precision, diagonal metric; rotated-dense: the same with the dense metric.
 */
import { advanceChain, createChainState, resolveChainSettings } from '@apsis/core';
import { autoregressiveGaussian, rotatedGaussian } from './gaussianTargets.js';

const kind = process.argv[2] ?? 'cheap';
const seconds = Number(process.argv[3] ?? 5);
const g = kind === 'cheap' ? autoregressiveGaussian(100, 0) : rotatedGaussian(100, 1e4, 'profile');
const settings = resolveChainSettings({ warmup: 300, draws: 1e9, metric: kind === 'rotated-dense' ? 'dense' : 'diagonal' });
const state = createChainState(g.target, settings, 0, 1);
for (let t = 0; t < settings.warmup; t++) advanceChain(g.target, settings, state);
const t0 = performance.now();
let steps = 0;
let n = 0;
while (performance.now() - t0 < seconds * 1000) {
  for (let k = 0; k < 100; k++) steps += advanceChain(g.target, settings, state).stats.leapfrogSteps;
  n += 100;
}
console.log(`${n} draws, ${steps} steps, ${(((performance.now() - t0) * 1e6) / steps).toFixed(0)} ns per step`);

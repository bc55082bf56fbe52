/**
 * Demo: sample a correlated 3-D Gaussian with NUTS and print a short summary.
 *
 *   pnpm demo        (tsx --conditions=source examples/gaussian.ts)
 *
 * The target is written by hand as a `Target`: a log-density and its gradient over a
 * Float64Array. Its mean and covariance are known, so the summary shows them beside
 * the sampled values.
 */
import { runChains, type Target } from '@apsis/core';

const names = ['a', 'b', 'c'];
const mean = [1, -2, 0.5];
const sd = [1, 3, 0.2];
const correlation = [
  [1, 0.8, -0.3],
  [0.8, 1, -0.5],
  [-0.3, -0.5, 1],
];
const dim = mean.length;

// Covariance Σ_ij = sd_i sd_j R_ij, and its inverse (the precision) by Gauss–Jordan.
const covariance = correlation.map((row, i) => row.map((r, j) => r * sd[i] * sd[j]));
const precision = invert(covariance);

const target: Target = {
  dim,
  names,
  logDensityGrad(x, grad) {
    let lp = 0;
    for (let i = 0; i < dim; i++) {
      let g = 0;
      for (let j = 0; j < dim; j++) g -= precision[i][j] * (x[j] - mean[j]);
      grad[i] = g;
      lp += 0.5 * (x[i] - mean[i]) * g;
    }
    return lp;
  },
};

const result = await runChains(target, { seed: 20240601, metric: 'dense' });

const pad = (s: string, n: number): string => s.padStart(n);
console.log(`apsis demo: correlated Gaussian, ${result.draws.length} chains × ${result.settings.draws} draws (seed ${result.seed})`);
console.log(`${pad('name', 6)}${pad('mean', 10)}${pad('true', 8)}${pad('sd', 10)}${pad('true', 8)}`);
for (let j = 0; j < dim; j++) {
  let s = 0;
  let s2 = 0;
  let n = 0;
  for (const d of result.draws) {
    for (let k = j; k < d.length; k += dim) {
      s += d[k];
      s2 += d[k] * d[k];
      n += 1;
    }
  }
  const m = s / n;
  const v = s2 / n - m * m;
  console.log(
    `${pad(names[j], 6)}${pad(m.toFixed(3), 10)}${pad(mean[j].toFixed(3), 8)}${pad(Math.sqrt(v).toFixed(3), 10)}${pad(sd[j].toFixed(3), 8)}`,
  );
}
let acceptance = 0;
let steps = 0;
let count = 0;
for (const st of result.stats) {
  for (let i = 0; i < st.acceptance.length; i++) {
    acceptance += st.acceptance[i];
    steps += st.leapfrogSteps[i];
    count += 1;
  }
}
const divergences = result.divergences.reduce((a, b) => a + b, 0);
console.log(
  `mean acceptance ${(acceptance / count).toFixed(3)}, leapfrog steps per draw ${(steps / count).toFixed(1)}, ` +
    `divergences ${divergences}, step sizes ${result.adaptation.map((a) => a.stepSize.toFixed(3)).join(' ')}, ` +
    `${result.elapsed.toFixed(2)} s`,
);

function invert(a: number[][]): number[][] {
  const n = a.length;
  const m = a.map((row, i) => [...row, ...row.map((_, j) => (i === j ? 1 : 0))]);
  for (let c = 0; c < n; c++) {
    let p = c;
    for (let r = c + 1; r < n; r++) if (Math.abs(m[r][c]) > Math.abs(m[p][c])) p = r;
    [m[c], m[p]] = [m[p], m[c]];
    const d = m[c][c];
    for (let k = 0; k < 2 * n; k++) m[c][k] /= d;
    for (let r = 0; r < n; r++) {
      if (r === c) continue;
      const f = m[r][c];
      for (let k = 0; k < 2 * n; k++) m[r][k] -= f * m[c][k];
    }
  }
  return m.map((row) => row.slice(n));
}

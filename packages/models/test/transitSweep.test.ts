import { describe, expect, it } from 'vitest';
import { createLightCurveKernel } from '../src/transit/lightCurve.js';
import { quadraticTransitFluxWithPartials } from '../src/transit/quadraticFlux.js';
import { skySeparationWithPartials, type TransitOrbit } from '../src/transit/transitGeometry.js';

// The kernel meets each planet's transit windows by a sweep through the sorted times
// and skips every point it does not reach. These tests evaluate every sub-sample of
// every point without any window (brute force: the geometry and flux functions point
// by point) and require the same flux and the same vector-Jacobian product.

/** Park–Miller minimal standard generator, seeded (Park & Miller 1988, CACM 31, 1192). */
function lcg(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 16807) % 2147483647;
    return s / 2147483647;
  };
}

/** Planet blocks [P, tc, e, omega, a/R_*, b, k] (invented). */
const PLANETS = [
  [3.2, 0.41, 0.05, 1.2, 9.5, 0.3, 0.1],
  [7.9, -13.6, 0.3, -2.0, 16, 0.55, 0.07], // tc far before the data
  [1.1, 40.3, 0.15, 0.6, 3.1, 0.4, 0.16], // short period, wide window: with 40-min exposures consecutive candidate ranges overlap
];
const U = [0.41, 0.23];
const DIM = 7 * PLANETS.length + 2;

function params(blocks: number[][]): Float64Array {
  return Float64Array.from([...blocks.flat(), ...U]);
}

function orbitOf(b: number[]): TransitOrbit {
  return { period: b[0], tc: b[1], eccentricity: b[2], omega: b[3], scaledSemiMajorAxis: b[4], impactParameter: b[5] };
}

/**
 * Brute force: flux and Σ_i w_i ∂flux_i/∂θ from every sub-sample t_i + T_i((j + ½)/n − ½)
 * of every point (the kernel's midpoint rule, Kipping 2010), chaining ∂F/∂z of the
 * flux function with ∂z/∂θ of the sky separation; no window, no sweep.
 */
function bruteForce(times: Float64Array, exposure: Float64Array, n: number, blocks: number[][], weights: Float64Array): { flux: Float64Array; grad: Float64Array } {
  const dim = 7 * blocks.length + 2;
  const flux = new Float64Array(times.length).fill(1);
  const grad = new Float64Array(dim);
  const sep = new Float64Array(7);
  const fp = new Float64Array(5);
  blocks.forEach((b, p) => {
    const orbit = orbitOf(b);
    for (let i = 0; i < times.length; i++) {
      const h = n > 1 ? exposure[i] / 2 : 0;
      const step = exposure[i] / n;
      for (let j = 0; j < n; j++) {
        const t = n > 1 ? times[i] - h + step * (j + 0.5) : times[i];
        if (!skySeparationWithPartials(t, orbit, sep, 0) || !(sep[0] < 1 + b[6])) continue;
        const F = quadraticTransitFluxWithPartials(sep[0], b[6], U[0], U[1], fp, 0);
        flux[i] -= (1 - F) / n;
        const w = weights[i] / n;
        for (let q = 0; q < 6; q++) grad[7 * p + q] += w * fp[1] * sep[1 + q];
        grad[7 * p + 6] += w * fp[2];
        grad[dim - 2] += w * fp[3];
        grad[dim - 1] += w * fp[4];
      }
    }
  });
  return { flux, grad };
}

/** Unsorted times over [0, 40) days with repeats, a point exactly at the first mid-transit, and gaps. */
function scrambledTimes(count: number, seed: number): Float64Array {
  const u = lcg(seed);
  const t = Array.from({ length: count }, () => 40 * u());
  for (let i = 0; i < 30; i++) t[Math.floor(u() * count)] = t[i]; // repeated times
  t[7] = PLANETS[0][1];
  // A gap: no points in [20, 23) days.
  return Float64Array.from(t.map((x) => (x >= 20 && x < 23 ? x - 3 : x)));
}

function maxAbs(a: Float64Array): number {
  return a.reduce((m, x) => Math.max(m, Math.abs(x)), 0);
}

describe('light-curve kernel: window sweep against a brute-force evaluation of every point', () => {
  const cases = [
    { label: 'instantaneous', n: 1, exposure: (_: number) => 0 },
    { label: '5 sub-samples, 40-minute exposures', n: 5, exposure: (_: number) => 40 / 1440 },
    { label: '7 sub-samples, exposures from 0 to 2 hours', n: 7, exposure: (i: number) => (i % 4) * (40 / 1440) },
  ];
  for (const c of cases) {
    it(`unsorted times, three planets, ${c.label}`, () => {
      const times = scrambledTimes(6000, 987654321);
      const exposure = Float64Array.from(times, (_, i) => c.exposure(i));
      const kernel = createLightCurveKernel({ times, planets: 3, exposureTime: exposure, subSamples: c.n });
      const theta = params(PLANETS);
      const u = lcg(4242);
      const weights = Float64Array.from(times, () => u() - 0.3);
      const want = bruteForce(times, exposure, c.n, PLANETS, weights);
      const flux = kernel.flux(theta);
      let inTransit = 0;
      for (let i = 0; i < times.length; i++) {
        if (want.flux[i] < 1) inTransit++;
        expect(Math.abs(flux[i] - want.flux[i]), `t = ${times[i]}`).toBeLessThan(1e-15);
      }
      // Every planet transits many times in the data.
      expect(inTransit).toBeGreaterThan(300);
      const scale = maxAbs(want.grad);
      const grad = new Float64Array(DIM);
      kernel.vjp(theta, weights, grad);
      for (let j = 0; j < DIM; j++) expect(Math.abs(grad[j] - want.grad[j]), kernel.names[j]).toBeLessThan(1e-12 * scale);
      const kept = new Float64Array(DIM);
      kernel.fluxKeepingJacobian(theta);
      kernel.vjpFromLast(weights, kept);
      for (let j = 0; j < DIM; j++) expect(Math.abs(kept[j] - want.grad[j]), kernel.names[j]).toBeLessThan(1e-12 * scale);
    });
  }

  it('gives each point the same flux whatever the order of the times', () => {
    const sorted = Float64Array.from(scrambledTimes(3000, 1357)).sort();
    const u = lcg(2468);
    const perm = Array.from(sorted, (_, i) => i);
    for (let i = perm.length - 1; i > 0; i--) {
      const j = Math.floor(u() * (i + 1));
      [perm[i], perm[j]] = [perm[j], perm[i]];
    }
    const shuffled = Float64Array.from(perm, (i) => sorted[i]);
    const theta = params(PLANETS);
    const a = createLightCurveKernel({ times: sorted, planets: 3, exposureTime: 0.02, subSamples: 3 });
    const b = createLightCurveKernel({ times: shuffled, planets: 3, exposureTime: 0.02, subSamples: 3 });
    const fa = Float64Array.from(a.flux(theta));
    const fb = b.flux(theta);
    for (let q = 0; q < perm.length; q++) expect(fb[q]).toBe(fa[perm[q]]);
    // Gradients: the same terms summed in another order.
    const wa = Float64Array.from(sorted, (_, i) => Math.cos(0.7 * i));
    const wb = Float64Array.from(perm, (i) => wa[i]);
    const ga = new Float64Array(DIM);
    const gb = new Float64Array(DIM);
    a.vjp(theta, wa, ga);
    b.vjp(theta, wb, gb);
    const scale = maxAbs(ga);
    for (let j = 0; j < DIM; j++) expect(Math.abs(ga[j] - gb[j])).toBeLessThan(1e-13 * scale);
  });

  it('handles data that start and end inside a transit, and a planet without a window', () => {
    const P = PLANETS[0];
    // Mid-transit at tc + 2P; the data run from 30 min after it to 20 min before the
    // mid-transit 4 periods later.
    const start = P[1] + 2 * P[0] + 30 / 1440;
    const end = P[1] + 6 * P[0] - 20 / 1440;
    const times = Float64Array.from({ length: 4000 }, (_, i) => start + ((end - start) * i) / 3999);
    // a/R_* = 1.3, b = 0.1, k = 0.35: z < 1 + k at every phase in front of the star, so
    // this planet has no window and all its points go through the chunked loop.
    const blocks = [P, [2.3, 0.2, 0, 0, 1.3, 0.1, 0.35]];
    const theta = Float64Array.from([...blocks.flat(), ...U]);
    const dim = theta.length;
    const kernel = createLightCurveKernel({ times, planets: 2, exposureTime: 0.01, subSamples: 2 });
    const u = lcg(777);
    const weights = Float64Array.from(times, () => u());
    const want = bruteForce(times, new Float64Array(times.length).fill(0.01), 2, blocks, weights);
    const second = bruteForce(times, new Float64Array(times.length).fill(0.01), 2, [blocks[1]], weights);
    expect(second.flux.filter((f) => f < 1).length).toBeGreaterThan(0.4 * times.length);
    const got = kernel.flux(theta);
    expect(got[0]).toBeLessThan(1); // the first point is in transit
    expect(got[times.length - 1]).toBeLessThan(1); // and the last
    for (let i = 0; i < times.length; i++) expect(Math.abs(got[i] - want.flux[i])).toBeLessThan(1e-15);
    const grad = new Float64Array(dim);
    kernel.vjp(theta, weights, grad);
    const scale = maxAbs(want.grad);
    for (let j = 0; j < dim; j++) expect(Math.abs(grad[j] - want.grad[j]), kernel.names[j]).toBeLessThan(1e-12 * scale);
  });
});

/**
 * Invented, seeded inputs for the report's tests: AR(1) chains, made-up sampler
 * statistics and two made-up data panels. No real run or scenario is involved.
 */
import type { ChainStats, FitGroup, FitPanel, ModelCurve, ReportInput } from '../src/index.js';

/** Mulberry32 (a small public-domain 32-bit generator): uniform on [0, 1). */
export function uniformStream(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Standard normal draws by the Box–Muller transform (Box & Muller 1958). */
export function normalStream(seed: number): () => number {
  const u = uniformStream(seed);
  return () => {
    const u1 = 1 - u();
    return Math.sqrt(-2 * Math.log(u1)) * Math.cos(2 * Math.PI * u());
  };
}

/** An AR(1) series x_t = phi x_{t−1} + sqrt(1 − phi²) ε_t with unit marginal variance. */
export function ar1(normal: () => number, n: number, phi: number): Float64Array {
  const out = new Float64Array(n);
  let x = normal();
  const s = Math.sqrt(1 - phi * phi);
  for (let i = 0; i < n; i++) {
    x = phi * x + s * normal();
    out[i] = x;
  }
  return out;
}

export interface SyntheticOptions {
  seed?: number;
  chains?: number;
  draws?: number;
  /** Fraction of draws marked divergent. */
  divergentRate?: number;
  /** Shift of the last chain's mean, in posterior sds (0: all chains agree). */
  stuckShift?: number;
  names?: string[];
}

const defaultNames = ['period', 'K', 'eccentricity', 'offset A', 'jitter <b>B</b>', 'mass'];
const centres = [3.2000012, 41.5, 0.12, -3.1, 2.4, 0.85];
const scales = [8e-7, 1.8, 0.04, 0.9, 0.5, 0.05];
export const syntheticUnits: Record<string, string> = {
  period: 'd',
  K: 'm/s',
  'offset A': 'm/s',
  'jitter <b>B</b>': 'm/s',
  mass: 'Jupiter masses',
};

function foldedSine(phase: number, k: number): number {
  return k * Math.sin(2 * Math.PI * phase);
}

/** A depth-d trapezoid dip centred at 0 (hours), full width w, ingress t. */
function dip(t: number, depth: number, w: number, ingress: number): number {
  const a = Math.abs(t);
  if (a >= w / 2) return 1;
  if (a <= w / 2 - ingress) return 1 - depth;
  return 1 - (depth * (w / 2 - a)) / ingress;
}

function fitPanels(normal: () => number, uniform: () => number, kDraws: Float64Array): FitPanel[] {
  const groups: FitGroup[] = [];
  const residuals: FitGroup[] = [];
  const labels = ['spectrograph A', 'spectrograph B'];
  labels.forEach((label, g) => {
    const n = g === 0 ? 30 : 18;
    const x = new Float64Array(n);
    const y = new Float64Array(n);
    const e = new Float64Array(n);
    const r = new Float64Array(n);
    for (let i = 0; i < n; i++) {
      x[i] = uniform();
      e[i] = 2 + 2 * uniform();
      y[i] = foldedSine(x[i], 41.5) + e[i] * normal();
      r[i] = y[i] - foldedSine(x[i], 41.5);
    }
    groups.push({ label, x, y, yErr: e });
    residuals.push({ label, x, y: r, yErr: e });
  });
  const rvModel: ModelCurve[] = [];
  for (let m = 0; m < 60; m++) {
    const x = Float64Array.from({ length: 200 }, (_, i) => i / 199);
    rvModel.push({ x, y: x.map((p) => foldedSine(p, kDraws[m % kDraws.length])) });
  }
  const tx = Float64Array.from({ length: 500 }, (_, i) => -4 + (8 * i) / 499);
  const ty = tx.map((t) => dip(t, 0.0042, 3.1, 0.35) + 0.0006 * normal());
  const tr = ty.map((v, i) => v - dip(tx[i], 0.0042, 3.1, 0.35));
  const transitModel: ModelCurve[] = [];
  for (let m = 0; m < 30; m++) {
    const depth = 0.0042 * (1 + 0.03 * normal());
    const x = Float64Array.from({ length: 800 }, (_, i) => -4 + (8 * i) / 799);
    transitModel.push({ x, y: x.map((t) => dip(t, depth, 3.1, 0.35)) });
  }
  return [
    { title: 'Radial velocity, folded on the period', xLabel: 'orbital phase', yLabel: 'radial velocity', yUnit: 'm/s', groups, modelDraws: rvModel, residuals },
    {
      title: 'Transit, folded on the period',
      xLabel: 'time from mid-transit',
      xUnit: 'h',
      yLabel: 'relative flux',
      groups: [{ label: 'photometer', x: tx, y: ty, yErr: new Float64Array(tx.length).fill(0.0006) }],
      modelDraws: transitModel,
      residuals: [{ label: 'photometer', x: tx, y: tr, yErr: new Float64Array(tx.length).fill(0.0006) }],
    },
  ];
}

/** A complete report input built from seeded draws. */
export function syntheticInput(options: SyntheticOptions = {}): ReportInput {
  const seed = options.seed ?? 20240611;
  const chains = options.chains ?? 4;
  const draws = options.draws ?? 1000;
  const names = options.names ?? defaultNames;
  const dim = names.length;
  const normal = normalStream(seed);
  const uniform = uniformStream(seed + 1);
  const chainDraws: Float64Array[] = [];
  const stats: ChainStats[] = [];
  for (let c = 0; c < chains; c++) {
    const a = new Float64Array(draws * dim);
    for (let j = 0; j < dim; j++) {
      const series = ar1(normal, draws, 0.3 + 0.1 * j);
      const shift = c === chains - 1 ? (options.stuckShift ?? 0) : 0;
      for (let i = 0; i < draws; i++) a[i * dim + j] = centres[j % centres.length] + scales[j % scales.length] * (series[i] + shift);
    }
    chainDraws.push(a);
    const divergent = new Uint8Array(draws);
    const treeDepth = new Int32Array(draws);
    const acceptance = new Float64Array(draws);
    const leapfrogSteps = new Int32Array(draws);
    const energy = ar1(normal, draws, 0.5 + 0.1 * c).map((v) => 12 + 2.5 * v);
    for (let i = 0; i < draws; i++) {
      divergent[i] = uniform() < (options.divergentRate ?? 0.004) ? 1 : 0;
      treeDepth[i] = Math.min(8, 2 + Math.floor(uniform() * 4 + uniform() * 3));
      leapfrogSteps[i] = 2 ** treeDepth[i] - 1;
      acceptance[i] = Math.min(1, Math.max(0, 0.85 + 0.12 * normal()));
    }
    stats.push({ divergent, treeDepth, acceptance, leapfrogSteps, energy, stepSize: new Float64Array(draws).fill(0.31 + 0.02 * c) });
  }
  const kColumn = names.indexOf('K');
  const kDraws = Float64Array.from({ length: 100 }, (_, i) => (kColumn >= 0 ? chainDraws[0][i * dim + kColumn] : 41.5));
  return {
    title: 'Synthetic run: two invented planets',
    subtitle: 'Seeded AR(1) draws standing in for a sampler run',
    createdAt: '2024-06-11T09:30:00Z',
    run: {
      seed,
      chains,
      warmup: 500,
      draws,
      method: 'NUTS',
      metric: 'diagonal',
      backend: 'wasm',
      elapsedSeconds: 83.4,
      maxTreeDepth: 8,
      targetAcceptance: 0.8,
      notes: ['Invented data for testing the report.'],
    },
    quantities: { names, units: syntheticUnits, chains: chainDraws },
    stats,
    warnings: [
      { severity: 'warning', message: 'Some draws diverged.', advice: 'Increase the target acceptance or reparameterise.' },
      { severity: 'note', message: 'The eccentricity posterior touches zero.' },
    ],
    fits: fitPanels(normal, uniform, kDraws),
  };
}

import { z } from 'zod';
import type { Target } from '../../target.js';
import { ModeSearchOptionsError } from '../errors.js';
import { strongWolfeLineSearch } from './wolfeLineSearch.js';

/** Options of {@link findMode}. */
export interface ModeSearchOptions {
  /** Starting unconstrained position (default: zeros). */
  readonly init?: Float64Array;
  /** Iteration budget (default 1000). */
  readonly maxIterations?: number;
  /** Stop when max |∂ log p/∂x| falls below this (default 1e-6). */
  readonly gradientTolerance?: number;
  /** Stop when one iteration changes log p by less than this × max(1, |log p|) (default 1e-13). */
  readonly relativeTolerance?: number;
  /** Number of (s, y) pairs kept by L-BFGS (default 10). */
  readonly history?: number;
}

/** Why {@link findMode} stopped. */
export type ModeSearchReason =
  | 'gradient below tolerance'
  | 'log-density change below tolerance'
  | 'iteration limit reached'
  | 'line search failed'
  | 'non-finite log-density at the start';

/** Result of {@link findMode}. */
export interface ModeSearchResult {
  /** Unconstrained position of the (local) mode found. */
  readonly position: Float64Array;
  /** log p at `position`. */
  readonly logDensity: number;
  /** ∂ log p/∂x at `position`. */
  readonly gradient: Float64Array;
  readonly iterations: number;
  /** Target evaluations, line searches included. */
  readonly evaluations: number;
  readonly converged: boolean;
  readonly reason: ModeSearchReason;
}

const optionsSchema = z.strictObject({
  init: z.instanceof(Float64Array).optional(),
  maxIterations: z.number().int().min(1).optional(),
  gradientTolerance: z.number().positive().optional(),
  relativeTolerance: z.number().min(0).optional(),
  history: z.number().int().min(1).max(1000).optional(),
});

const EXPECTED: Record<string, string> = {
  init: 'a Float64Array of length target.dim',
  maxIterations: 'an integer >= 1',
  gradientTolerance: 'a finite number > 0',
  relativeTolerance: 'a finite number >= 0',
  history: 'an integer from 1 to 1000',
};

function dot(a: Float64Array, b: Float64Array): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function maxAbs(a: Float64Array): number {
  let m = 0;
  for (let i = 0; i < a.length; i++) m = Math.max(m, Math.abs(a[i]));
  return m;
}

/**
 * Finds a posterior mode of any {@link Target} in float64: L-BFGS (Nocedal & Wright
 * 2006, Algorithm 7.4 two-loop recursion with H₀ = (sᵀy / yᵀy) I, Algorithm 7.5)
 * on −log p, each step by a line search satisfying the strong Wolfe conditions
 * (c₁ = 1e-4, c₂ = 0.9). Positions where log p is not finite are treated as very
 * large −log p, so the search backs off from the edges of the support.
 *
 * Note that for a compiled model the mode is over the unconstrained coordinates
 * (Jacobian terms included), not the mode of the constrained posterior density.
 */
export function findMode(target: Target, options: ModeSearchOptions = {}): ModeSearchResult {
  if (target === null || typeof target !== 'object' || !Number.isInteger(target.dim) || target.dim < 1 || typeof target.logDensityGrad !== 'function') {
    throw new ModeSearchOptionsError('target', target, 'a Target { dim, logDensityGrad }');
  }
  const r = optionsSchema.safeParse(options);
  if (!r.success) {
    const issue = r.error.issues[0];
    const key = issue.code === 'unrecognized_keys' ? issue.keys[0] : String(issue.path[0] ?? '');
    throw new ModeSearchOptionsError(`findMode options.${key}`, (options as Record<string, unknown>)[key], EXPECTED[key] ?? `no such option; options are ${Object.keys(EXPECTED).join(', ')}`);
  }
  const n = target.dim;
  if (options.init !== undefined && options.init.length !== n) {
    throw new ModeSearchOptionsError('findMode options.init', options.init, `a Float64Array of length ${n} (target.dim)`);
  }
  const maxIterations = options.maxIterations ?? 1000;
  const gradTol = options.gradientTolerance ?? 1e-6;
  const relTol = options.relativeTolerance ?? 1e-13;
  const m = options.history ?? 10;

  const x = options.init ? options.init.slice() : new Float64Array(n);
  const g = new Float64Array(n); // gradient of f = −log p
  const trialX = new Float64Array(n);
  const trialG = new Float64Array(n);
  const dir = new Float64Array(n);
  const S = Array.from({ length: m }, () => new Float64Array(n));
  const Y = Array.from({ length: m }, () => new Float64Array(n));
  const rho = new Float64Array(m);
  const alphaBuf = new Float64Array(m);
  let stored = 0;
  let head = 0;
  let evaluations = 0;

  const evalAt = (pos: Float64Array, grad: Float64Array): number => {
    evaluations++;
    const lp = target.logDensityGrad(pos, grad);
    for (let i = 0; i < n; i++) grad[i] = -grad[i];
    return Number.isFinite(lp) ? -lp : Infinity;
  };

  let f = evalAt(x, g);
  const result = (iterations: number, converged: boolean, reason: ModeSearchReason): ModeSearchResult => {
    const gradient = new Float64Array(n);
    for (let i = 0; i < n; i++) gradient[i] = -g[i];
    return { position: x, logDensity: -f, gradient, iterations, evaluations, converged, reason };
  };
  if (!Number.isFinite(f) || !g.every(Number.isFinite)) return result(0, false, 'non-finite log-density at the start');
  if (maxAbs(g) <= gradTol) return result(0, true, 'gradient below tolerance');

  for (let iter = 1; iter <= maxIterations; iter++) {
    // Two-loop recursion: dir = −H g.
    for (let i = 0; i < n; i++) dir[i] = -g[i];
    for (let k = 0; k < stored; k++) {
      const j = (head - 1 - k + m) % m;
      const a = rho[j] * dot(S[j], dir);
      alphaBuf[j] = a;
      for (let i = 0; i < n; i++) dir[i] -= a * Y[j][i];
    }
    if (stored > 0) {
      const j = (head - 1 + m) % m;
      const gammaScale = dot(S[j], Y[j]) / dot(Y[j], Y[j]);
      for (let i = 0; i < n; i++) dir[i] *= gammaScale;
    }
    for (let k = stored - 1; k >= 0; k--) {
      const j = (head - 1 - k + m) % m;
      const b = rho[j] * dot(Y[j], dir);
      for (let i = 0; i < n; i++) dir[i] += (alphaBuf[j] - b) * S[j][i];
    }
    let slope0 = dot(g, dir);
    if (!(slope0 < 0)) {
      // Not a descent direction (numerical trouble): restart from steepest descent.
      stored = 0;
      for (let i = 0; i < n; i++) dir[i] = -g[i];
      slope0 = dot(g, dir);
    }
    const initial = stored === 0 ? Math.min(1, 1 / Math.max(1e-300, maxAbs(g))) : 1;
    let trialValue = NaN;
    const phi = (alpha: number): { value: number; slope: number } => {
      for (let i = 0; i < n; i++) trialX[i] = x[i] + alpha * dir[i];
      trialValue = evalAt(trialX, trialG);
      return { value: trialValue, slope: Number.isFinite(trialValue) ? dot(trialG, dir) : NaN };
    };
    const ls = strongWolfeLineSearch(phi, { value: f, slope: slope0 }, initial, {
      c1: 1e-4,
      c2: 0.9,
      maxStep: 1e10,
      maxEvaluations: 40,
    });
    if (!ls.ok) return result(iter - 1, maxAbs(g) <= gradTol, 'line search failed');
    // trialX/trialG must hold the accepted point.
    if (ls.lastEvaluated !== ls.step) phi(ls.step);
    const s = S[head];
    const y = Y[head];
    for (let i = 0; i < n; i++) {
      s[i] = trialX[i] - x[i];
      y[i] = trialG[i] - g[i];
    }
    const sy = dot(s, y);
    const previous = f;
    f = trialValue;
    x.set(trialX);
    g.set(trialG);
    if (sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y))) {
      rho[head] = 1 / sy;
      head = (head + 1) % m;
      stored = Math.min(stored + 1, m);
    }
    if (maxAbs(g) <= gradTol) return result(iter, true, 'gradient below tolerance');
    if (Math.abs(previous - f) <= relTol * Math.max(1, Math.abs(f))) {
      return result(iter, true, 'log-density change below tolerance');
    }
  }
  return result(maxIterations, false, 'iteration limit reached');
}

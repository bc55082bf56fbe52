import { z } from 'zod';
import { OptionError, SamplerStatsError } from './errors.js';

/**
 * Sampler health from the per-draw statistics of HMC/NUTS chains: divergences, E-BFMI,
 * tree-depth saturation, step size, acceptance.
 */

/**
 * Per-draw statistics of one chain, columnar (one entry per draw). Every field is optional;
 * health figures that need a missing field are null. Units: stepSize in the sampler's
 * unconstrained coordinates, energy in nats (negative log density plus kinetic energy).
 */
export interface SamplerStatsColumns {
  readonly stepSize?: ArrayLike<number>;
  /** Tree depth (number of trajectory doublings) of each draw. */
  readonly treeDepth?: ArrayLike<number>;
  readonly leapfrogSteps?: ArrayLike<number>;
  /** 1 (or true) when the draw's trajectory diverged. */
  readonly divergent?: ArrayLike<number | boolean>;
  /** Hamiltonian (total energy) at each draw. */
  readonly energy?: ArrayLike<number>;
  /** Acceptance statistic of each draw, in [0, 1]. */
  readonly acceptance?: ArrayLike<number>;
  readonly logDensity?: ArrayLike<number>;
}

export interface HealthOptions {
  /** Maximum tree depth the sampler was run with; needed for the saturation share. */
  maxTreeDepth?: number;
}

export interface ChainHealth {
  readonly chain: number;
  readonly draws: number;
  readonly divergences: number | null;
  /** divergences / draws. */
  readonly divergenceFraction: number | null;
  /** Energy Bayesian fraction of missing information (Betancourt 2016); dimensionless. */
  readonly ebfmi: number | null;
  /** Draws whose tree depth reached the maximum. */
  readonly treeDepthHits: number | null;
  /** treeDepthHits / draws. */
  readonly treeDepthShare: number | null;
  /** Mean step size over the draws (constant after warmup in most samplers). */
  readonly stepSize: number | null;
  readonly meanAcceptance: number | null;
  readonly meanTreeDepth: number | null;
  readonly meanLeapfrogSteps: number | null;
}

export interface SamplerHealth {
  readonly chains: ChainHealth[];
  readonly totalDraws: number;
  readonly totalDivergences: number | null;
  readonly maxTreeDepth: number | null;
}

/**
 * E-BFMI of one chain's energies (Betancourt 2016, arXiv:1604.00695, the estimator
 * BFMI ≈ sum_{n≥1} (E_n - E_{n-1})^2 / sum_n (E_n - mean E)^2). Near 1 or above is healthy;
 * below 0.3 the momentum resampling explores the energy distribution poorly.
 * @returns NaN for fewer than 2 draws or constant energy
 */
export function energyBfmi(energy: ArrayLike<number>): number {
  const n = energy.length;
  if (n < 2) return NaN;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += energy[i];
  mean /= n;
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    den += (energy[i] - mean) ** 2;
    if (i > 0) num += (energy[i] - energy[i - 1]) ** 2;
  }
  return den > 0 ? num / den : NaN;
}

const FIELDS = ['stepSize', 'treeDepth', 'leapfrogSteps', 'divergent', 'energy', 'acceptance', 'logDensity'] as const;

const column = z.custom<ArrayLike<number | boolean>>((v) => Array.isArray(v) || (ArrayBuffer.isView(v) && !(v instanceof DataView)), {
  message: 'expected an array or typed array with one entry per draw',
});
const statsSchema = z
  .array(
    z.object({
      stepSize: column.optional(),
      treeDepth: column.optional(),
      leapfrogSteps: column.optional(),
      divergent: column.optional(),
      energy: column.optional(),
      acceptance: column.optional(),
      logDensity: column.optional(),
    }),
  )
  .min(1, { message: 'expected statistics for at least one chain' });

function validate(stats: unknown): SamplerStatsColumns[] {
  const parsed = statsSchema.safeParse(stats);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const p = issue.path.map(String);
    const at = p.length >= 2 ? `stats[${p[0]}].${p[1]}` : p.length === 1 ? `stats[${p[0]}]` : 'stats';
    throw new SamplerStatsError(at, `${at}: ${issue.message}`);
  }
  const chains = parsed.data as SamplerStatsColumns[];
  chains.forEach((chain, c) => {
    let length: number | null = null;
    let first = '';
    for (const name of FIELDS) {
      const col = chain[name];
      if (col === undefined) continue;
      if (length === null) {
        length = col.length;
        first = name;
      } else if (col.length !== length) {
        throw new SamplerStatsError(`stats[${c}].${name}`, `stats[${c}].${name}: expected ${length} entries (as many as stats[${c}].${first}), got ${col.length}`);
      }
      for (let i = 0; i < col.length; i++) {
        const v = col[i];
        const ok = name === 'divergent' ? typeof v === 'boolean' || v === 0 || v === 1 : typeof v === 'number' && Number.isFinite(v);
        if (!ok) {
          const expected = name === 'divergent' ? 'true/false or 0/1' : 'a finite number';
          throw new SamplerStatsError(`stats[${c}].${name}[${i}]`, `stats[${c}].${name}[${i}]: expected ${expected}, got ${String(v)}`);
        }
      }
    }
  });
  return chains;
}

function meanOf(x: ArrayLike<number> | undefined): number | null {
  if (x === undefined || x.length === 0) return null;
  let s = 0;
  for (let i = 0; i < x.length; i++) s += x[i];
  return s / x.length;
}

function drawsOf(chain: SamplerStatsColumns): number {
  for (const name of FIELDS) if (chain[name] !== undefined) return chain[name]!.length;
  return 0;
}

/**
 * Health figures per chain from the sampler's per-draw statistics (draws after warmup).
 * @param stats one SamplerStatsColumns per chain
 * @throws SamplerStatsError (wrong shape, unequal column lengths, non-finite entries), OptionError
 */
export function samplerHealth(stats: readonly SamplerStatsColumns[], options: HealthOptions = {}): SamplerHealth {
  const maxDepth = options.maxTreeDepth;
  if (maxDepth !== undefined && !(Number.isInteger(maxDepth) && maxDepth >= 1)) {
    throw new OptionError('options.maxTreeDepth', `options.maxTreeDepth: expected a positive integer, got ${String(maxDepth)}`);
  }
  const chains = validate(stats).map((chain, c): ChainHealth => {
    const draws = drawsOf(chain);
    let divergences: number | null = null;
    if (chain.divergent !== undefined) {
      divergences = 0;
      for (let i = 0; i < chain.divergent.length; i++) if (chain.divergent[i] === true || chain.divergent[i] === 1) divergences++;
    }
    let hits: number | null = null;
    if (chain.treeDepth !== undefined && maxDepth !== undefined) {
      hits = 0;
      for (let i = 0; i < chain.treeDepth.length; i++) if (chain.treeDepth[i] >= maxDepth) hits++;
    }
    const ebfmi = chain.energy === undefined ? NaN : energyBfmi(chain.energy);
    return {
      chain: c,
      draws,
      divergences,
      divergenceFraction: divergences === null || draws === 0 ? null : divergences / draws,
      ebfmi: Number.isFinite(ebfmi) ? ebfmi : null,
      treeDepthHits: hits,
      treeDepthShare: hits === null || draws === 0 ? null : hits / draws,
      stepSize: meanOf(chain.stepSize),
      meanAcceptance: meanOf(chain.acceptance),
      meanTreeDepth: meanOf(chain.treeDepth),
      meanLeapfrogSteps: meanOf(chain.leapfrogSteps),
    };
  });
  const haveDivergent = chains.every((c) => c.divergences !== null);
  return {
    chains,
    totalDraws: chains.reduce((s, c) => s + c.draws, 0),
    totalDivergences: haveDivergent ? chains.reduce((s, c) => s + (c.divergences ?? 0), 0) : null,
    maxTreeDepth: maxDepth ?? null,
  };
}

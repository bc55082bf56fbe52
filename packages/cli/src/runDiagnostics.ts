import type { RunFolderContents } from '@apsis/core';
import {
  convergenceVerdict,
  samplerHealth,
  summarize,
  TooFewDrawsError,
  type ConvergenceVerdict,
  type NamedChains,
  type SamplerHealth,
  type SummaryTable,
  type WarningThresholds,
} from '@apsis/diagnostics';

/** What `summary` and `report` compute from a run folder. */
export interface RunDiagnostics {
  /** null when there are too few draws to summarise. */
  readonly table: SummaryTable | null;
  readonly health: SamplerHealth | null;
  readonly verdict: ConvergenceVerdict | null;
  /** Why there is no table, in words. */
  readonly tooFew: string | null;
}

/** Column `j` of each chain's row-major matrix of `width` columns. */
function columnOf(chains: readonly Float64Array[], width: number, j: number): Float64Array[] {
  return chains.map((m) => {
    const n = m.length / width;
    const out = new Float64Array(n);
    for (let i = 0, k = j; i < n; i++, k += width) out[i] = m[k];
    return out;
  });
}

/**
 * The named quantities to summarise: the outputs when the run has them (constrained
 * values and derived quantities), else the coordinates; with `all`, both, the
 * coordinates then named `u:<name>`.
 */
export function runQuantities(run: RunFolderContents, all: boolean): NamedChains[] {
  const out: NamedChains[] = [];
  const outputs = run.outputs;
  if (outputs) outputs.names.forEach((name, j) => out.push({ name, chains: columnOf(outputs.values, outputs.names.length, j) }));
  if (!outputs || all) {
    const names = run.names ?? Array.from({ length: run.dim }, (_, j) => `x[${j}]`);
    names.forEach((name, j) => out.push({ name: outputs ? `u:${name}` : name, chains: columnOf(run.draws, run.dim, j) }));
  }
  return out;
}

/** Summary table, sampler health and verdict of a run folder's draws. */
export function runDiagnostics(
  run: RunFolderContents,
  options: { all: boolean; thresholds: Partial<WarningThresholds>; strict: boolean },
): RunDiagnostics {
  let table: SummaryTable;
  try {
    table = summarize(runQuantities(run, options.all));
  } catch (e) {
    if (e instanceof TooFewDrawsError) {
      return { table: null, health: null, verdict: null, tooFew: `too few draws to judge convergence (${run.drawsPerChain.join(', ')} per chain; at least 8 needed)` };
    }
    throw e;
  }
  const health = samplerHealth(
    run.stats.map((s) => ({ stepSize: s.stepSize, treeDepth: s.treeDepth, leapfrogSteps: s.leapfrogSteps, divergent: s.divergent, energy: s.energy, acceptance: s.acceptance })),
    run.settings.method === 'nuts' ? { maxTreeDepth: run.settings.maxTreeDepth } : {},
  );
  const verdict = convergenceVerdict(table, health, { thresholds: options.thresholds, strict: options.strict });
  return { table, health, verdict, tooFew: null };
}

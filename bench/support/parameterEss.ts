import type { Target } from '@apsis/core';
import { minBulkEss } from './minEss.js';

/**
 * The columns whose ESS counts: for a target with named outputs and `parameters` (a
 * built model), the physical values of its sampled parameters; otherwise the coordinates.
 */
function parameterColumns(target: Target & { parameters?: readonly { names: readonly string[] }[] }, draws: readonly Float64Array[]): { columns: Float64Array[]; width: number } {
  const dim = target.dim;
  if (!target.outputs || !target.parameters) return { columns: [...draws], width: dim };
  const names = target.outputs.names;
  const wanted = target.parameters.flatMap((p) => p.names).map((n) => names.indexOf(n));
  if (wanted.some((j) => j < 0)) throw new Error('a parameter column is missing from the outputs');
  const row = new Float64Array(names.length);
  const columns = draws.map((d) => {
    const n = d.length / dim;
    const out = new Float64Array(n * wanted.length);
    for (let i = 0; i < n; i++) {
      target.outputs!.write(d.subarray(i * dim, (i + 1) * dim), row);
      for (let j = 0; j < wanted.length; j++) out[i * wanted.length + j] = row[wanted[j]];
    }
    return out;
  });
  return { columns, width: wanted.length };
}

/** Smallest bulk-ESS over the columns of {@link parameterColumns}. */
export function minParameterEss(target: Target, draws: readonly Float64Array[]): number {
  const { columns, width } = parameterColumns(target, draws);
  return minBulkEss(columns, width).ess;
}

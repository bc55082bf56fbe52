import { bulkEss } from '@apsis/diagnostics';

/**
 * Smallest bulk-ESS over the coordinates of several chains' draws (each draws × dim,
 * row-major), with the coordinate where it occurs. Uses `bulkEss` from
 * @apsis/diagnostics (rank-normalised, split chains).
 */
export function minBulkEss(draws: readonly Float64Array[], dim: number): { ess: number; coordinate: number } {
  let ess = Infinity;
  let coordinate = -1;
  const columns = draws.map((d) => new Float64Array(d.length / dim));
  for (let j = 0; j < dim; j++) {
    for (let c = 0; c < draws.length; c++) {
      const d = draws[c];
      const col = columns[c];
      for (let i = 0; i < col.length; i++) col[i] = d[i * dim + j];
    }
    const raw = bulkEss(columns);
    const e = Number.isNaN(raw) ? 0 : raw; // NaN: a constant column (a chain that never moved)
    if (!(e >= ess)) {
      ess = e;
      coordinate = j;
    }
  }
  return { ess, coordinate };
}

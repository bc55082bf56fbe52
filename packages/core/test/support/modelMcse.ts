import * as diagnostics from '@apsis/diagnostics';

/**
 * MCSE of the mean of pooled chains by non-overlapping batch means with batch size
 * ⌊√n⌋ per chain (Flegal & Jones 2010, Annals of Statistics 38, 1034, section 2):
 * σ̂² = b/(A − 1) Σₖ (Ȳₖ − Ȳ)² over all A batches, MCSE = √(σ̂²/N).
 */
export function batchMeansMcse(chains: readonly Float64Array[]): number {
  const n = Math.min(...chains.map((c) => c.length));
  const b = Math.max(1, Math.floor(Math.sqrt(n)));
  const a = Math.floor(n / b);
  const means: number[] = [];
  for (const c of chains) {
    for (let k = 0; k < a; k++) {
      let s = 0;
      for (let i = k * b; i < (k + 1) * b; i++) s += c[i];
      means.push(s / b);
    }
  }
  const overall = means.reduce((s, m) => s + m, 0) / means.length;
  const ss = means.reduce((s, m) => s + (m - overall) ** 2, 0);
  const sigma2 = (b * ss) / (means.length - 1);
  return Math.sqrt(sigma2 / (means.length * b));
}

/**
 * MCSE of the mean: `mcseOfMean` of @apsis/diagnostics (sd/√ESS, Vehtari et al. 2021)
 * when the package resolves to a build that has it, else {@link batchMeansMcse}.
 */
export function mcseOfMeanOf(chains: readonly Float64Array[]): number {
  const f = (diagnostics as unknown as { mcseOfMean?: (c: readonly Float64Array[]) => number }).mcseOfMean;
  return typeof f === 'function' ? f(chains) : batchMeansMcse(chains);
}

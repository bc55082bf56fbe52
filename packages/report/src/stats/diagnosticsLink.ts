/**
 * The convergence diagnostics come from @apsis/diagnostics. The report looks the
 * functions up by their documented names (splitRhat, bulkEss, tailEss, mcseOfMean,
 * each taking one quantity's chains) and leaves the columns empty when one is missing, so a
 * report can still be drawn while that package is incomplete.
 */
import * as diagnostics from '@apsis/diagnostics';

/** A diagnostic of one scalar quantity over several chains. */
export type ChainDiagnostic = (chains: ArrayLike<number>[]) => number;

/** A diagnostic's result as one number: a number itself, or a summary object's main field. */
function asNumber(result: unknown): number {
  if (typeof result === 'number') return result;
  if (result && typeof result === 'object') {
    const r = result as Record<string, unknown>;
    for (const key of ['value', 'max', 'rhat', 'ess']) {
      if (typeof r[key] === 'number') return r[key] as number;
    }
  }
  return Number.NaN;
}

/** The named diagnostic from @apsis/diagnostics, or undefined if it is not there. */
export function findDiagnostic(name: 'splitRhat' | 'bulkEss' | 'tailEss' | 'mcseOfMean'): ChainDiagnostic | undefined {
  const f = (diagnostics as unknown as Record<string, unknown>)[name];
  if (typeof f !== 'function') return undefined;
  return (chains) => {
    try {
      return asNumber((f as (c: ArrayLike<number>[]) => unknown)(chains));
    } catch {
      return Number.NaN;
    }
  };
}

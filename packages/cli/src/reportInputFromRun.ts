import { basename } from 'node:path';
import type { RunFolderContents } from '@apsis/core';
import type { DiagnosticWarning } from '@apsis/diagnostics';
import type { ReportInput, ReportWarning } from '@apsis/report';
import { runQuantities } from './runDiagnostics.js';

function interleave(chains: readonly Float64Array[][]): Float64Array[] {
  // chains[q][c] → per chain, draws × quantities row-major
  const q = chains.length;
  return chains[0].map((_, c) => {
    const n = chains[0][c].length;
    const out = new Float64Array(n * q);
    for (let j = 0; j < q; j++) {
      const col = chains[j][c];
      for (let i = 0; i < n; i++) out[i * q + j] = col[i];
    }
    return out;
  });
}

/** The report's plain input from a run folder read back, plus the diagnostics' warnings. */
export function reportInputFromRun(run: RunFolderContents, folder: string, warnings: readonly DiagnosticWarning[], title?: string): ReportInput {
  const quantities = runQuantities(run, false);
  const shortest = Math.min(...run.drawsPerChain);
  const chains = quantities.map((q) => (q.chains as Float64Array[]).map((c) => c.subarray(0, shortest)));
  const m = run.manifest;
  const notes = [...run.notes];
  if (run.outcome) notes.unshift(`Stopped: ${run.outcome.stop.message}.`);
  const reportWarnings: ReportWarning[] = warnings.map((w) => ({
    severity: w.severity === 'problem' ? 'problem' : 'warning',
    message: w.message,
    advice: w.advice,
    ...(w.quantity !== null ? { quantity: w.quantity } : {}),
  }));
  return {
    title: title ?? m.label ?? `Run ${basename(folder)}`,
    subtitle: `run ${m.runId.slice(0, 8)}`,
    createdAt: m.createdAt,
    run: {
      seed: m.seed,
      chains: m.chains,
      warmup: m.settings.warmup,
      draws: shortest,
      method: m.settings.method === 'nuts' ? 'NUTS' : 'HMC',
      metric: m.settings.metric,
      elapsedSeconds: run.elapsed,
      ...(m.settings.method === 'nuts' ? { maxTreeDepth: m.settings.maxTreeDepth } : {}),
      targetAcceptance: m.settings.targetAcceptance,
      notes,
    },
    quantities: { names: quantities.map((q) => q.name), chains: interleave(chains) },
    stats: run.stats.map((s) => ({
      divergent: s.divergent.subarray(0, shortest),
      treeDepth: s.treeDepth.subarray(0, shortest),
      energy: s.energy.subarray(0, shortest),
      stepSize: s.stepSize.subarray(0, shortest),
      acceptance: s.acceptance.subarray(0, shortest),
      leapfrogSteps: s.leapfrogSteps.subarray(0, shortest),
    })),
    warnings: reportWarnings,
  };
}

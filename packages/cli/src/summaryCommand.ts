import { resolve } from 'node:path';
import { readRun, type RunFolderContents } from '@apsis/core';
import { formatSummaryText, formatVerdict, formatWarnings, summaryToJsonValue, type SamplerHealth } from '@apsis/diagnostics';
import { exitStatus, type CliIo } from './cliIo.js';
import { helpText } from './helpText.js';
import { numberOption, parseCommandLine } from './parseCommandLine.js';
import { runDiagnostics } from './runDiagnostics.js';

/** The run in a few lines: what was run, how far it got, how it ended. */
export function runDescription(run: RunFolderContents): string[] {
  const m = run.manifest;
  const s = m.settings;
  const lines = [
    `run ${m.runId.slice(0, 8)}${m.label ? ` (${m.label})` : ''}, started ${m.createdAt}`,
    `sampler: ${s.method === 'nuts' ? 'NUTS' : 'static HMC'}, ${s.metric} metric, ${m.chains} chains, ${s.warmup} warmup iterations, seed ${m.seed}`,
  ];
  if (run.outcome) lines.push(`finished: ${run.outcome.stop.message} (${run.outcome.elapsedSeconds.toFixed(1)} s)`);
  else lines.push(`not finished: ${run.drawsPerChain.join(', ')} draws per chain so far (resume with: apsis resume <run folder>)`);
  return lines;
}

function healthText(h: SamplerHealth): string {
  const per = h.chains
    .map((c) => `chain ${c.chain}: ${c.divergences ?? '?'} divergent, E-BFMI ${c.ebfmi === null ? 'undefined' : c.ebfmi.toFixed(2)}${c.treeDepthHits !== null ? `, ${c.treeDepthHits} at max tree depth` : ''}, step size ${c.stepSize === null ? '?' : c.stepSize.toPrecision(3)}`)
    .join('\n  ');
  return `Sampler health (${h.totalDivergences ?? '?'} divergent transitions in ${h.totalDraws} draws):\n  ${per}\n`;
}

/** `apsis summary <run folder> [--json] [--all] [--rhat X] [--ess-per-chain N] [--strict]`. */
export function summaryCommand(args: readonly string[], io: CliIo): number {
  const { folder, values } = parseCommandLine('summary', args, {
    json: { type: 'boolean' },
    all: { type: 'boolean' },
    rhat: { type: 'string' },
    'ess-per-chain': { type: 'string' },
    strict: { type: 'boolean' },
  });
  if (folder === null) {
    io.stdout.write(helpText.summary);
    return exitStatus.ok;
  }
  const rhat = numberOption('summary', 'rhat', values.rhat, (x) => x > 1, 'a number above 1, e.g. 1.01');
  const ess = numberOption('summary', 'ess-per-chain', values['ess-per-chain'], (x) => x >= 0, 'a number >= 0');
  const run = readRun(resolve(io.cwd, folder));
  const d = runDiagnostics(run, {
    all: values.all === true,
    strict: values.strict === true,
    thresholds: { ...(rhat !== undefined ? { rhat } : {}), ...(ess !== undefined ? { essPerChain: ess } : {}) },
  });
  const converged = d.verdict?.converged ?? false;
  if (values.json === true) {
    const out = {
      format: 'apsis-run-summary',
      version: 1,
      folder: resolve(io.cwd, folder),
      run: {
        runId: run.manifest.runId,
        label: run.manifest.label,
        seed: run.manifest.seed,
        chains: run.manifest.chains,
        warmup: run.manifest.settings.warmup,
        drawsPerChain: run.drawsPerChain,
        finished: run.outcome !== null,
        stop: run.outcome?.stop ?? null,
      },
      summary: d.table ? summaryToJsonValue(d.table) : null,
      health: d.health,
      verdict: d.verdict ? { converged: d.verdict.converged, reasons: d.verdict.reasons, warnings: d.verdict.warnings } : { converged: false, reasons: [d.tooFew], warnings: [] },
      notes: run.notes,
    };
    io.stdout.write(JSON.stringify(out, (_k, v: unknown) => (typeof v === 'number' && !Number.isFinite(v) ? null : v), 2) + '\n');
    return converged ? exitStatus.ok : exitStatus.notConverged;
  }
  const parts: string[] = [runDescription(run).join('\n') + '\n'];
  if (run.notes.length > 0) parts.push(`Notes:\n${run.notes.map((n) => `  - ${n}`).join('\n')}\n`);
  if (d.table === null) {
    parts.push(`Converged: no\n  - ${d.tooFew}\n`);
  } else {
    parts.push(formatSummaryText(d.table));
    parts.push(healthText(d.health!));
    parts.push(formatWarnings(d.verdict!.warnings));
    parts.push(formatVerdict(d.verdict!));
  }
  io.stdout.write(parts.join('\n'));
  return converged ? exitStatus.ok : exitStatus.notConverged;
}

/** The table describing the run itself. */
import { escapeText } from '../escape.js';
import { formatSignificant } from '../format.js';
import type { RunInfo } from '../input.js';

function duration(seconds: number): string {
  if (seconds < 120) return `${formatSignificant(seconds, 3)} s`;
  if (seconds < 7200) return `${formatSignificant(seconds / 60, 3)} min`;
  return `${formatSignificant(seconds / 3600, 3)} h`;
}

/** HTML key/value table of the run's settings; `keptDraws` is the draws per chain actually given. */
export function runTable(run: RunInfo, keptDraws: number, createdAt: string | undefined): string {
  const rows: [string, string][] = [
    ['method', run.method],
    ['seed', String(run.seed)],
    ['chains', String(run.chains)],
    ['warmup iterations per chain', String(run.warmup)],
    ['draws per chain', keptDraws === run.draws ? String(run.draws) : `${keptDraws} shown of ${run.draws} asked for`],
  ];
  if (run.metric !== undefined) rows.push(['metric (mass matrix)', run.metric]);
  if (run.targetAcceptance !== undefined) rows.push(['target acceptance', String(run.targetAcceptance)]);
  if (run.maxTreeDepth !== undefined) rows.push(['tree-depth limit', String(run.maxTreeDepth)]);
  if (run.backend !== undefined) rows.push(['backend', run.backend]);
  if (run.elapsedSeconds !== undefined) rows.push(['elapsed', duration(run.elapsedSeconds)]);
  if (createdAt !== undefined) rows.push(['created', createdAt]);
  const body = rows.map(([k, v]) => `<tr><th class="text">${escapeText(k)}</th><td class="text">${escapeText(v)}</td></tr>`).join('\n');
  const notes = (run.notes ?? []).map((n) => `<p>${escapeText(n)}</p>`).join('\n');
  return `<table class="run"><tbody>\n${body}\n</tbody></table>${notes}`;
}

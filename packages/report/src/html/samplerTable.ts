/** Per-chain sampler health table. */
import { escapeText } from '../escape.js';
import { formatCount, formatFixed, formatSignificant } from '../format.js';
import type { ChainHealth } from '../stats/chainHealth.js';
import { chainFlags } from '../stats/flags.js';

/** HTML table, one row per chain. */
export function samplerTable(health: readonly ChainHealth[]): string {
  const head =
    '<tr><th>chain</th><th>draws</th><th>divergent</th><th>at depth limit</th><th>deepest tree</th>' +
    '<th>mean leapfrog steps</th><th>step size</th><th>mean acceptance</th><th>E-BFMI</th><th class="text">check</th></tr>';
  const body = health
    .map((h, c) => {
      const flags = chainFlags(h);
      const check = flags.length
        ? `<span class="badge warning">CHECK</span>${escapeText(flags.join('; '))}`
        : '<span class="badge ok">OK</span>';
      return (
        `<tr${flags.length ? ' class="flagged"' : ''}><td>${c + 1}</td><td>${formatCount(h.draws)}</td>` +
        `<td>${formatCount(h.divergences)}</td><td>${formatCount(h.depthLimitHits)}</td><td>${formatCount(h.maxTreeDepthSeen)}</td>` +
        `<td>${formatSignificant(h.meanLeapfrogSteps, 3)}</td><td>${formatSignificant(h.stepSize, 3)}</td>` +
        `<td>${formatFixed(h.meanAcceptance, 2)}</td><td>${formatFixed(h.ebfmi, 2)}</td><td class="text check">${check}</td></tr>`
      );
    })
    .join('\n');
  return `<div class="table-scroll"><table class="sampler"><thead>${head}</thead><tbody>\n${body}\n</tbody></table></div>`;
}

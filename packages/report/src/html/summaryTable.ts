/** The summary table: one row per quantity, flagged rows labelled in words. */
import { escapeText } from '../escape.js';
import { formatCount, formatFixed, formatSignificant, formatToScale } from '../format.js';
import type { SummaryRow } from '../input.js';
import { summaryFlags } from '../stats/flags.js';

/** HTML table of summary rows. Mean and quantiles are shown to the resolution of the sd. */
export function summaryTable(rows: readonly SummaryRow[], units: Record<string, string>, chains: number): string {
  const head =
    '<tr><th>quantity</th><th class="text">unit</th><th>mean</th><th>sd</th><th>5 %</th><th>50 %</th><th>95 %</th>' +
    '<th>MCSE of mean</th><th>bulk ESS</th><th>tail ESS</th><th>R-hat</th><th class="text">check</th></tr>';
  const body = rows
    .map((r) => {
      const flags = summaryFlags(r, chains);
      const check = flags.length
        ? `<span class="badge warning">CHECK</span>${escapeText(flags.join('; '))}`
        : '<span class="badge ok">OK</span>';
      const cells = [
        `<td>${escapeText(r.name)}</td>`,
        `<td class="text">${escapeText(units[r.name] ?? '')}</td>`,
        `<td>${formatToScale(r.mean, r.sd)}</td>`,
        `<td>${formatSignificant(r.sd, 2)}</td>`,
        `<td>${formatToScale(r.q05, r.sd)}</td>`,
        `<td>${formatToScale(r.q50, r.sd)}</td>`,
        `<td>${formatToScale(r.q95, r.sd)}</td>`,
        `<td>${formatSignificant(r.mcseMean, 2)}</td>`,
        `<td>${formatCount(r.essBulk)}</td>`,
        `<td>${formatCount(r.essTail)}</td>`,
        `<td>${formatFixed(r.rhat, 3)}</td>`,
        `<td class="text check">${check}</td>`,
      ];
      return `<tr${flags.length ? ' class="flagged"' : ''} data-quantity="${escapeText(r.name)}">${cells.join('')}</tr>`;
    })
    .join('\n');
  return `<div class="table-scroll"><table class="summary"><thead>${head}</thead><tbody>\n${body}\n</tbody></table></div>`;
}

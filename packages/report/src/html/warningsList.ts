/** The list of warnings, most serious first, each with a text badge. */
import { escapeText } from '../escape.js';
import type { ReportWarning, Severity } from '../input.js';

const rank: Record<Severity, number> = { problem: 0, warning: 1, note: 2 };
const badge: Record<Severity, string> = { problem: 'PROBLEM', warning: 'WARNING', note: 'NOTE' };

/** HTML list of warnings; an explicit sentence when there are none. */
export function warningsList(warnings: readonly ReportWarning[]): string {
  if (warnings.length === 0) return '<p><span class="badge ok">NONE</span>No warnings.</p>';
  const sorted = [...warnings].sort((a, b) => rank[a.severity] - rank[b.severity]);
  const items = sorted
    .map((w) => {
      const about = w.quantity ? ` <em>(${escapeText(w.quantity)})</em>` : '';
      const advice = w.advice ? `<span class="advice">What to do: ${escapeText(w.advice)}</span>` : '';
      return `<li class="${w.severity}"><span class="badge ${w.severity}">${badge[w.severity]}</span>${escapeText(w.message)}${about}${advice}</li>`;
    })
    .join('\n');
  return `<ul class="warnings">\n${items}\n</ul>`;
}

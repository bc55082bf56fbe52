/** The chain legend shown above the trace and rank plots. */
import { escapeText } from '../escape.js';
import { seriesColour, seriesDash } from '../palette.js';
import { element } from '../svg.js';

/** A line swatch in chain c's colour and dash, then its name. */
export function chainSwatch(c: number): string {
  const line = element('line', { x1: 1, y1: 6, x2: 23, y2: 6, stroke: seriesColour(c), 'stroke-width': 3, 'stroke-dasharray': seriesDash(c) });
  return `<span>${element('svg', { width: 24, height: 12, 'aria-hidden': 'true', class: 'swatch' }, line)}${escapeText(`chain ${c + 1}`)}</span>`;
}

/** Legend for all chains and for the divergence ticks. */
export function chainLegend(chains: number, hasDivergences: boolean): string {
  let items = '';
  for (let c = 0; c < chains; c++) items += chainSwatch(c);
  if (hasDivergences) {
    const tick = element('path', { d: 'M12 1v10', stroke: '#000000', 'stroke-width': 1.5 });
    items += `<span>${element('svg', { width: 24, height: 12, 'aria-hidden': 'true', class: 'swatch' }, tick)}divergent draw (tick under a trace)</span>`;
  }
  return `<div class="legend-row">${items}</div>`;
}

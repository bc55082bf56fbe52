/**
 * One number per chain as a dot on a line (E-BFMI, step size, mean acceptance),
 * with an optional reference value drawn as a dashed line. A chain on the wrong
 * side of the reference gets a text flag beside its value.
 */
import { drawBottomAxis, makeAxis } from '../axes.js';
import { formatSignificant } from '../format.js';
import { ink, seriesColour } from '../palette.js';
import { type Box, bottom, element, px, right, svgDocument, text } from '../svg.js';

export interface ChainValuePlotOptions {
  /** Written as data-plot, e.g. "health-ebfmi". */
  kind: string;
  label: string;
  unit?: string;
  /** One value per chain; NaN or undefined for "not recorded". */
  values: readonly (number | undefined)[];
  /** Axis range; by default from 0 to a bit past the largest value and reference. */
  domain?: readonly [number, number];
  reference?: {
    value: number;
    label: string;
    /** Which side is a problem: values below (or above) the reference are flagged. */
    flag: 'below' | 'above' | 'none';
    flagText: string;
  };
  width?: number;
}

/** The plot as a standalone <svg>. */
export function chainValuePlot(options: ChainValuePlotOptions): string {
  const width = options.width ?? 270;
  const rowHeight = 20;
  const chains = options.values.length;
  const box: Box = { left: 58, top: 22, width: width - 58 - 66, height: rowHeight * chains };
  const height = bottom(box) + 44;
  const finite = options.values.filter((v): v is number => v !== undefined && Number.isFinite(v));
  const peak = Math.max(...finite, options.reference?.value ?? 0, 1e-12);
  const domain = options.domain ?? [0, peak * 1.15];
  const axis = makeAxis(domain, [box.left, right(box)], options.label, options.unit, 4);

  let out = element('rect', { x: box.left, y: box.top, width: box.width, height: box.height, fill: 'none', stroke: ink.grid });
  if (options.reference) {
    const rx = axis.scale(options.reference.value);
    out += element('path', { class: 'reference', d: `M${px(rx)} ${px(box.top - 4)}V${px(bottom(box))}`, stroke: ink.axis, 'stroke-dasharray': '4 3', fill: 'none' });
    out += text(rx, box.top - 8, options.reference.label, { 'text-anchor': 'middle', class: 'note' });
  }
  options.values.forEach((v, c) => {
    const y = box.top + rowHeight * (c + 0.5);
    out += text(box.left - 6, y + 3.5, `chain ${c + 1}`, { 'text-anchor': 'end', class: 'tick-label' });
    if (v === undefined || !Number.isFinite(v)) {
      out += text(box.left + 4, y + 3.5, 'not recorded', { class: 'note' });
      return;
    }
    const x = axis.scale(Math.min(Math.max(v, domain[0]), domain[1]));
    out += element('path', { class: 'value-stem', d: `M${px(box.left)} ${px(y)}H${px(x)}`, stroke: seriesColour(c), 'stroke-width': 1.5, fill: 'none' });
    out += element('circle', { class: 'value-dot', cx: x, cy: y, r: 4, fill: seriesColour(c) });
    const ref = options.reference;
    const flagged = ref && ((ref.flag === 'below' && v < ref.value) || (ref.flag === 'above' && v > ref.value));
    out += text(right(box) + 6, y + 3.5, `${formatSignificant(v, 3)}${flagged ? ` ${ref.flagText}` : ''}`, {
      class: flagged ? 'value-label flagged' : 'value-label',
    });
  });
  out += drawBottomAxis(box, axis, {});
  return svgDocument({ kind: options.kind, width, height, title: `${options.label} per chain` }, out);
}

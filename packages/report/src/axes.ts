/**
 * Axes with nice ticks and titled units. An axis is built once from a domain and
 * a pixel range, then drawn along the bottom or the left edge of a plot box.
 */
import { niceTicks } from './ticks.js';
import { powerOfTen, tickLabels } from './format.js';
import { ink } from './palette.js';
import { type Domain, linearScale } from './scale.js';
import { type Box, bottom, element, px, right, text } from './svg.js';

export interface Axis {
  domain: Domain;
  /** Data units → pixels. */
  scale: (value: number) => number;
  /** Tick positions in data units. */
  ticks: number[];
  /** Tick labels, after any offset and power of ten were taken out. */
  labels: string[];
  /** Axis title: label, offset, unit and power of ten, e.g. "period − 3.2 [d]". */
  title: string;
}

/**
 * Axis title. The unit goes in square brackets; an offset taken out of the tick
 * labels is written "label − offset"; a common power of ten is written "×10⁻⁶"
 * after the unit.
 */
export function axisTitle(label: string, unit: string | undefined, offsetText = '', exponent = 0): string {
  let title = label;
  if (offsetText) title += ` \u2212 ${offsetText.startsWith('\u2212') ? `(${offsetText})` : offsetText}`;
  if (unit) title += ` [${unit}]`;
  if (exponent !== 0) title += ` ${powerOfTen(exponent)}`;
  return title;
}

/** An axis over `domain` drawn across pixels `range`, with about `target` ticks. */
export function makeAxis(domain: Domain, range: Domain, label: string, unit?: string, target = 5): Axis {
  const { values, step } = niceTicks(domain[0], domain[1], target);
  const { labels, offsetText, exponent } = tickLabels(values, step);
  return {
    domain,
    scale: linearScale(domain, range),
    ticks: values,
    labels,
    title: axisTitle(label, unit, offsetText, exponent),
  };
}

export interface DrawOptions {
  /** Light grid lines across the box at each tick. */
  grid?: boolean;
  /** Draw the tick labels (default true). */
  labels?: boolean;
  /** Draw the axis title (default true). */
  title?: boolean;
  /** Extra gap in pixels between the box edge and the axis line. */
  gap?: number;
}

const TICK = 4;

/**
 * Attributes that squeeze a title into `room` pixels when its estimated width
 * (about 6.2 px per character at the 11 px title size) would not fit.
 */
export function fitText(content: string, room: number): Record<string, string | undefined> {
  return content.length * 6.2 > room ? { textLength: px(room), lengthAdjust: 'spacingAndGlyphs' } : {};
}

/** The axis along the bottom edge of `box`. */
export function drawBottomAxis(box: Box, axis: Axis, options: DrawOptions = {}): string {
  const y0 = bottom(box) + (options.gap ?? 0);
  let ticks = '';
  let grid = '';
  let labels = '';
  axis.ticks.forEach((t, i) => {
    const x = axis.scale(t);
    ticks += `M${px(x)} ${px(y0)}v${TICK}`;
    if (options.grid) grid += `M${px(x)} ${px(box.top)}V${px(bottom(box))}`;
    if (options.labels !== false) {
      labels += text(x, y0 + TICK + 10, axis.labels[i], { 'text-anchor': 'middle', class: 'tick-label' });
    }
  });
  let out = '';
  if (grid) out += element('path', { d: grid, class: 'grid', stroke: ink.grid, fill: 'none' });
  out += element('path', { d: `M${px(box.left)} ${px(y0)}H${px(right(box))}${ticks}`, stroke: ink.axis, fill: 'none', class: 'axis-line' });
  out += labels;
  if (options.title !== false) {
    out += text(box.left + box.width / 2, y0 + TICK + 25, axis.title, {
      'text-anchor': 'middle',
      class: 'axis-title',
      ...fitText(axis.title, box.width + 20),
    });
  }
  return element('g', { class: 'axis axis-x' }, out);
}

/** The axis along the left edge of `box`. */
export function drawLeftAxis(box: Box, axis: Axis, options: DrawOptions = {}): string {
  const x0 = box.left - (options.gap ?? 0);
  let ticks = '';
  let grid = '';
  let labels = '';
  let widest = 0;
  axis.ticks.forEach((t, i) => {
    const y = axis.scale(t);
    ticks += `M${px(x0)} ${px(y)}h${-TICK}`;
    if (options.grid) grid += `M${px(box.left)} ${px(y)}H${px(right(box))}`;
    if (options.labels !== false) {
      labels += text(x0 - TICK - 2, y + 3.5, axis.labels[i], { 'text-anchor': 'end', class: 'tick-label' });
      widest = Math.max(widest, axis.labels[i].length);
    }
  });
  let out = '';
  if (grid) out += element('path', { d: grid, class: 'grid', stroke: ink.grid, fill: 'none' });
  out += element('path', { d: `M${px(x0)} ${px(box.top)}V${px(bottom(box))}${ticks}`, stroke: ink.axis, fill: 'none', class: 'axis-line' });
  out += labels;
  if (options.title !== false) {
    const tx = x0 - TICK - 8 - widest * 5.6;
    const ty = box.top + box.height / 2;
    out += text(tx, ty, axis.title, {
      'text-anchor': 'middle',
      transform: `rotate(-90 ${px(tx)} ${px(ty)})`,
      class: 'axis-title',
      ...fitText(axis.title, box.height + 16),
    });
  }
  return element('g', { class: 'axis axis-y' }, out);
}

/** Small helpers for writing SVG markup as strings. */
import { escapeText } from './escape.js';

export type Attributes = Record<string, string | number | undefined>;

/** A pixel coordinate rounded to 0.1 px, the resolution the plots need. */
export function px(value: number): string {
  const r = Math.round(value * 10) / 10;
  return Object.is(r, -0) ? '0' : String(r);
}

function attributeText(attributes: Attributes): string {
  let out = '';
  for (const [key, value] of Object.entries(attributes)) {
    if (value === undefined) continue;
    out += ` ${key}="${escapeText(typeof value === 'number' ? px(value) : value)}"`;
  }
  return out;
}

/** An element with attributes and already-formed inner markup (or none). */
export function element(tag: string, attributes: Attributes, inner?: string): string {
  const open = `<${tag}${attributeText(attributes)}`;
  return inner === undefined ? `${open}/>` : `${open}>${inner}</${tag}>`;
}

/** A text element; the text is escaped here. */
export function text(x: number, y: number, content: string, attributes: Attributes = {}): string {
  return element('text', { x, y, ...attributes }, escapeText(content));
}

/** The `points` attribute of a polyline from pixel coordinates. */
export function points(xs: ArrayLike<number>, ys: ArrayLike<number>): string {
  const parts: string[] = new Array(xs.length);
  for (let i = 0; i < xs.length; i++) parts[i] = `${px(xs[i])},${px(ys[i])}`;
  return parts.join(' ');
}

/** Options common to every plot's outer <svg>. */
export interface PlotFrame {
  /** Plot kind, written as data-plot (trace, rank, pair, fit, health-…). */
  kind: string;
  width: number;
  height: number;
  /** Accessible description, also shown as a tooltip. */
  title: string;
  /** Extra data-* attributes, e.g. the quantity a plot shows. */
  data?: Record<string, string>;
}

/** A standalone <svg> element sized in pixels with a matching viewBox. */
export function svgDocument(frame: PlotFrame, inner: string): string {
  const data: Attributes = {};
  for (const [k, v] of Object.entries(frame.data ?? {})) data[`data-${k}`] = v;
  return element(
    'svg',
    {
      xmlns: 'http://www.w3.org/2000/svg',
      class: `plot plot-${frame.kind}`,
      'data-plot': frame.kind,
      ...data,
      width: frame.width,
      height: frame.height,
      viewBox: `0 0 ${px(frame.width)} ${px(frame.height)}`,
      role: 'img',
      'aria-label': frame.title,
    },
    element('title', {}, escapeText(frame.title)) + inner,
  );
}

/** Inner rectangle of a plot where data are drawn, in pixels. */
export interface Box {
  left: number;
  top: number;
  width: number;
  height: number;
}

export function right(box: Box): number {
  return box.left + box.width;
}

export function bottom(box: Box): number {
  return box.top + box.height;
}

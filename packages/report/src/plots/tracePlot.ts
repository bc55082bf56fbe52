/**
 * Trace plot of one quantity: every chain's draws against draw number, one
 * colour per chain, and a strip under the plot with a tick at every divergent
 * draw. Long chains are cut to a bounded number of points per line, keeping
 * each bin's extremes so spikes stay visible.
 */
import { drawBottomAxis, drawLeftAxis, makeAxis } from '../axes.js';
import { minMaxDownsample } from '../downsample.js';
import { ink, seriesColour, seriesDash } from '../palette.js';
import { extent, padDomain } from '../scale.js';
import { type Box, bottom, element, points, px, right, svgDocument, text } from '../svg.js';

export interface TracePlotOptions {
  name: string;
  unit?: string;
  /** This quantity's draws, one array per chain, all equally long. */
  chains: readonly ArrayLike<number>[];
  /** Divergence flags per chain (0/1), same lengths as the chains. */
  divergent?: readonly (Uint8Array | undefined)[];
  /** Points per chain's line (default 600). */
  maxPoints?: number;
  width?: number;
  height?: number;
}

const STRIP = 9;

/** A trace plot as a standalone <svg> (data-plot="trace"). */
export function tracePlot(options: TracePlotOptions): string {
  const width = options.width ?? 780;
  const height = options.height ?? 200;
  const maxPoints = options.maxPoints ?? 600;
  const n = options.chains[0]?.length ?? 0;
  const box: Box = { left: 70, top: 18, width: width - 70 - 14, height: height - 18 - STRIP - 44 };

  const x = makeAxis([0, Math.max(1, n - 1)], [box.left, right(box)], 'draw after warmup', undefined, 6);
  const y = makeAxis(padDomain(extent(options.chains)), [bottom(box), box.top], options.name, options.unit, 5);

  let lines = '';
  options.chains.forEach((chain, c) => {
    const d = minMaxDownsample(chain, maxPoints);
    const xs = d.index.map(x.scale);
    const ys = d.value.map(y.scale);
    lines += element('polyline', {
      class: 'trace-line',
      'data-chain': String(c + 1),
      points: points(xs, ys),
      fill: 'none',
      stroke: seriesColour(c),
      'stroke-width': 1,
      'stroke-dasharray': seriesDash(c),
      'stroke-linejoin': 'round',
      opacity: 0.8,
    });
  });

  // Divergent draws: one tick per pixel column that holds any, all chains together.
  const stripTop = bottom(box) + 2;
  const columns = new Set<number>();
  let divergentCount = 0;
  options.divergent?.forEach((flags) => {
    if (!flags) return;
    for (let i = 0; i < flags.length; i++) {
      if (flags[i]) {
        divergentCount++;
        columns.add(Math.round(x.scale(i) * 2) / 2);
      }
    }
  });
  let strip = '';
  if (columns.size > 0) {
    let d = '';
    for (const cx of [...columns].sort((a, b) => a - b)) d += `M${px(cx)} ${px(stripTop)}v${STRIP - 2}`;
    strip += element('path', { class: 'divergent-marks', d, stroke: ink.divergent, 'stroke-width': 1.2, fill: 'none' });
  }
  if (divergentCount > 0) {
    strip += text(right(box), box.top - 5, `${divergentCount} divergent: ticks below the plot`, { 'text-anchor': 'end', class: 'note' });
  }

  const inner =
    element('rect', { x: box.left, y: box.top, width: box.width, height: box.height, fill: 'none', stroke: ink.grid }) +
    drawLeftAxis(box, y, { grid: true }) +
    lines +
    strip +
    drawBottomAxis(box, x, { gap: STRIP + 1 });
  return svgDocument(
    {
      kind: 'trace',
      width,
      height,
      title: `Trace of ${options.name} for ${options.chains.length} chains`,
      data: { quantity: options.name },
    },
    inner,
  );
}

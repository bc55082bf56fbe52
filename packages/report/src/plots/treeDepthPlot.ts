/**
 * Share of draws at each NUTS tree depth, all chains pooled, with the depth limit
 * marked. Many draws at the limit mean trajectories were cut short.
 */
import { drawBottomAxis, drawLeftAxis, makeAxis } from '../axes.js';
import { ink, okabeIto } from '../palette.js';
import { type Box, bottom, element, px, right, svgDocument, text } from '../svg.js';

export interface TreeDepthPlotOptions {
  /** Tree depth of each draw, one array per chain. */
  chains: readonly ArrayLike<number>[];
  /** The sampler's depth limit, if known. */
  maxTreeDepth?: number;
  width?: number;
}

/** The plot as a standalone <svg> (data-plot="health-treedepth"). */
export function treeDepthPlot(options: TreeDepthPlotOptions): string {
  const width = options.width ?? 270;
  let deepest = options.maxTreeDepth ?? 0;
  let total = 0;
  for (const c of options.chains) for (let i = 0; i < c.length; i++) deepest = Math.max(deepest, c[i]);
  const counts = new Float64Array(deepest + 1);
  for (const c of options.chains) {
    for (let i = 0; i < c.length; i++) counts[c[i]]++;
    total += c.length;
  }
  const share = Array.from(counts, (v) => (100 * v) / Math.max(1, total));
  const box: Box = { left: 58, top: 22, width: width - 58 - 14, height: 110 };
  const height = bottom(box) + 44;
  const x = makeAxis([-0.5, deepest + 0.5], [box.left, right(box)], 'tree depth', undefined, Math.min(deepest + 1, 8));
  const y = makeAxis([0, Math.max(...share, 1) * 1.1], [bottom(box), box.top], 'share of draws', '%', 4);

  let out = element('rect', { x: box.left, y: box.top, width: box.width, height: box.height, fill: 'none', stroke: ink.grid });
  out += drawLeftAxis(box, y, { grid: true });
  let d = '';
  const half = (x.scale(1) - x.scale(0)) * 0.4;
  share.forEach((s, depth) => {
    if (s <= 0) return;
    const cx = x.scale(depth);
    d += `M${px(cx - half)} ${px(bottom(box))}V${px(y.scale(s))}H${px(cx + half)}V${px(bottom(box))}Z`;
  });
  out += element('path', { class: 'depth-bars', d, fill: okabeIto.bluishGreen, 'fill-opacity': 0.7, stroke: okabeIto.bluishGreen });
  if (options.maxTreeDepth !== undefined) {
    const lx = x.scale(options.maxTreeDepth);
    out += element('path', { class: 'reference', d: `M${px(lx)} ${px(box.top - 4)}V${px(bottom(box))}`, stroke: ink.axis, 'stroke-dasharray': '4 3', fill: 'none' });
    out += text(lx, box.top - 8, `limit ${options.maxTreeDepth}`, { 'text-anchor': 'middle', class: 'note' });
  }
  out += drawBottomAxis(box, x, {});
  return svgDocument({ kind: 'health-treedepth', width, height, title: 'Share of draws at each tree depth, all chains' }, out);
}

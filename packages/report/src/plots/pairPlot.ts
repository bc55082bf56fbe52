/**
 * Pair plot: a scatter matrix of a few quantities. Below the diagonal, draws of
 * one quantity against another (thinned evenly to a bounded number of points,
 * all chains pooled), with divergent draws drawn on top as crosses; on the
 * diagonal, each quantity's histogram; above it, the correlation coefficient.
 */
import { type Axis, drawBottomAxis, drawLeftAxis, fitText, makeAxis } from '../axes.js';
import { evenIndices } from '../downsample.js';
import { formatFixed } from '../format.js';
import { ink, okabeIto } from '../palette.js';
import { extent, linearScale, padDomain } from '../scale.js';
import { type Box, bottom, element, px, right, svgDocument, text } from '../svg.js';
import { correlation } from '../stats/quantile.js';

export interface PairPlotOptions {
  names: readonly string[];
  units?: Record<string, string>;
  /** Pooled draws (all chains, one after the other) of each named quantity. */
  pooled: readonly Float64Array[];
  /** Pooled divergence flags (0/1), same length as each pooled array. */
  divergent?: Uint8Array;
  /** Scatter points per cell (default 800). */
  maxPoints?: number;
  /** Width of one cell, pixels (default 150). */
  cell?: number;
  bins?: number;
}

/** A histogram of `values` in `bins` equal bins over `domain`. */
function histogram(values: ArrayLike<number>, domain: readonly [number, number], bins: number): Float64Array {
  const counts = new Float64Array(bins);
  const w = (domain[1] - domain[0]) / bins;
  for (let i = 0; i < values.length; i++) {
    const b = Math.min(bins - 1, Math.max(0, Math.floor((values[i] - domain[0]) / w)));
    counts[b]++;
  }
  return counts;
}

/** A pair plot as a standalone <svg> (data-plot="pair"). */
export function pairPlot(options: PairPlotOptions): string {
  const k = options.names.length;
  const cell = options.cell ?? 150;
  const gap = 8;
  const left = 76;
  const top = 8;
  const bottomMargin = 50;
  const width = left + k * cell + (k - 1) * gap + 12;
  const height = top + k * cell + (k - 1) * gap + bottomMargin;
  const maxPoints = options.maxPoints ?? 800;
  const bins = options.bins ?? 24;
  const n = options.pooled[0]?.length ?? 0;

  const domains = options.pooled.map((v) => padDomain(extent([v]), 0.05));
  const boxOf = (row: number, col: number): Box => ({
    left: left + col * (cell + gap),
    top: top + row * (cell + gap),
    width: cell,
    height: cell,
  });
  const unit = (name: string) => options.units?.[name];
  const xAxes: Axis[] = options.names.map((name, j) => makeAxis(domains[j], [boxOf(0, j).left, right(boxOf(0, j))], name, unit(name), 3));

  const keep = evenIndices(n, maxPoints);
  const divergentIndex: number[] = [];
  if (options.divergent) for (let i = 0; i < n; i++) if (options.divergent[i]) divergentIndex.push(i);
  const keepDivergent = evenIndices(divergentIndex.length, Math.max(1, Math.floor(maxPoints / 2))).map((i) => divergentIndex[i]);

  let out = '';
  for (let row = 0; row < k; row++) {
    for (let col = 0; col < k; col++) {
      const box = boxOf(row, col);
      out += element('rect', { x: box.left, y: box.top, width: box.width, height: box.height, fill: 'none', stroke: ink.grid });
      if (row === col) {
        const counts = histogram(options.pooled[col], domains[col], bins);
        const peak = Math.max(...counts) * 1.08 || 1;
        const xs = linearScale(domains[col], [box.left, right(box)]);
        const ys = linearScale([0, peak], [bottom(box), box.top]);
        const bw = (domains[col][1] - domains[col][0]) / bins;
        let d = `M${px(box.left)} ${px(bottom(box))}`;
        for (let b = 0; b < bins; b++) d += `V${px(ys(counts[b]))}H${px(xs(domains[col][0] + (b + 1) * bw))}`;
        d += `V${px(bottom(box))}Z`;
        out += element('path', { class: 'pair-histogram', d, fill: okabeIto.blue, 'fill-opacity': 0.35, stroke: okabeIto.blue, 'stroke-width': 1 });
        out += text(box.left + 4, box.top + 12, options.names[col], { class: 'cell-label', ...fitText(options.names[col], cell - 8) });
      } else if (row > col) {
        const xs = linearScale(domains[col], [box.left, right(box)]);
        const ys = linearScale(domains[row], [bottom(box), box.top]);
        const xv = options.pooled[col];
        const yv = options.pooled[row];
        let d = '';
        for (const i of keep) d += `M${px(xs(xv[i]))} ${px(ys(yv[i]))}h.01`;
        out += element('path', {
          class: 'pair-points',
          d,
          stroke: okabeIto.blue,
          'stroke-opacity': 0.35,
          'stroke-width': 2.6,
          'stroke-linecap': 'round',
          fill: 'none',
        });
        if (keepDivergent.length > 0) {
          let dd = '';
          for (const i of keepDivergent) {
            const cx = xs(xv[i]);
            const cy = ys(yv[i]);
            dd += `M${px(cx - 2.5)} ${px(cy - 2.5)}l5 5m0 -5l-5 5`;
          }
          out += element('path', { class: 'pair-divergent', d: dd, stroke: okabeIto.vermillion, 'stroke-width': 1.4, fill: 'none' });
        }
      } else {
        const r = correlation(options.pooled[col], options.pooled[row]);
        out += text(box.left + box.width / 2, box.top + box.height / 2 + 4, `r = ${formatFixed(r, 2)}`, {
          'text-anchor': 'middle',
          class: 'correlation',
        });
      }
      if (row === k - 1) {
        const axis = xAxes[col];
        out += drawBottomAxis(box, axis, { title: false });
        out += text(box.left + box.width / 2, bottom(box) + 4 + 25, axis.title, {
          'text-anchor': 'middle',
          class: 'axis-title',
          ...fitText(axis.title, cell),
        });
      }
      if (col === 0 && row > 0) {
        const axis = makeAxis(domains[row], [bottom(box), box.top], options.names[row], unit(options.names[row]), 3);
        out += drawLeftAxis(box, axis, { title: false });
        const tx = box.left - 62;
        const ty = box.top + box.height / 2;
        out += text(tx, ty, axis.title, {
          'text-anchor': 'middle',
          transform: `rotate(-90 ${px(tx)} ${px(ty)})`,
          class: 'axis-title',
          ...fitText(axis.title, cell),
        });
      }
    }
  }
  const shown = Math.min(n, keep.length);
  return svgDocument(
    {
      kind: 'pair',
      width,
      height,
      title: `Pair plot of ${options.names.join(', ')}: ${shown} of ${n} draws shown, ${divergentIndex.length} divergent`,
    },
    out,
  );
}

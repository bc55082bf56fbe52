/**
 * Rank plot of one quantity (Vehtari et al. 2021, Bayesian Analysis 16, 667,
 * sec. 4.2): the draws of all chains are ranked together, and each chain gets a
 * histogram of its own ranks. Chains that sample the same distribution give flat
 * histograms; a chain stuck in one region piles up at one end. The grey band is
 * the range that 99 % of bins would fall in for independent draws (binomial,
 * normal approximation), the dashed line the expected count.
 */
import { drawBottomAxis, makeAxis } from '../axes.js';
import { ink, seriesColour } from '../palette.js';
import { linearScale } from '../scale.js';
import { type Box, element, px, right, svgDocument, text } from '../svg.js';
import { pooledRanks, rankCounts } from '../stats/ranks.js';

export interface RankPlotOptions {
  name: string;
  /** This quantity's draws, one array per chain. */
  chains: readonly ArrayLike<number>[];
  /** Number of rank bins (default: 20, fewer for short chains). */
  bins?: number;
  width?: number;
  height?: number;
}

/** Default bin count: 20, or fewer so that a chain expects ≥ 10 draws per bin. */
export function defaultRankBins(drawsPerChain: number): number {
  return Math.max(2, Math.min(20, Math.floor(drawsPerChain / 10)));
}

const Z99 = 2.5758; // two-sided 99 % normal quantile (common practice)

/** A rank plot as a standalone <svg> (data-plot="rank"), one row per chain. */
export function rankPlot(options: RankPlotOptions): string {
  const width = options.width ?? 330;
  const height = options.height ?? 200;
  const chains = options.chains;
  const perChain = chains[0]?.length ?? 0;
  const total = chains.reduce((s, c) => s + c.length, 0);
  const bins = options.bins ?? defaultRankBins(perChain);
  const box: Box = { left: 52, top: 10, width: width - 52 - 12, height: height - 10 - 44 };

  const ranks = pooledRanks(chains);
  const counts = ranks.map((r) => rankCounts(r, total, bins));
  const p = 1 / bins;
  const expected = perChain * p;
  const spread = Z99 * Math.sqrt(perChain * p * (1 - p));
  const top = Math.max(expected + spread, ...counts.map((c) => Math.max(...c))) * 1.08;

  const x = makeAxis([0, total], [box.left, right(box)], 'rank of draw, all chains', undefined, 4);
  const gap = 3;
  const rowHeight = (box.height - gap * (chains.length - 1)) / chains.length;
  const binWidth = box.width / bins;

  let rows = '';
  counts.forEach((c, k) => {
    const rowTop = box.top + k * (rowHeight + gap);
    const y = linearScale([0, top], [rowTop + rowHeight, rowTop]);
    const lo = Math.max(0, expected - spread);
    rows += element('rect', {
      class: 'rank-band',
      x: box.left,
      y: y(expected + spread),
      width: box.width,
      height: y(lo) - y(expected + spread),
      fill: ink.band,
      opacity: 0.6,
    });
    let d = `M${px(box.left)} ${px(y(0))}`;
    for (let b = 0; b < bins; b++) {
      d += `V${px(y(c[b]))}H${px(box.left + (b + 1) * binWidth)}`;
    }
    d += `V${px(y(0))}Z`;
    rows += element('path', {
      class: 'rank-bars',
      'data-chain': String(k + 1),
      d,
      fill: seriesColour(k),
      'fill-opacity': 0.45,
      stroke: seriesColour(k),
      'stroke-width': 1,
    });
    rows += element('path', {
      class: 'rank-expected',
      d: `M${px(box.left)} ${px(y(expected))}H${px(right(box))}`,
      stroke: ink.axis,
      'stroke-dasharray': '3 3',
      fill: 'none',
    });
    rows += text(box.left - 6, rowTop + rowHeight / 2 + 3.5, `chain ${k + 1}`, { 'text-anchor': 'end', class: 'tick-label' });
  });

  const inner = rows + drawBottomAxis(box, x, {});
  return svgDocument(
    {
      kind: 'rank',
      width,
      height,
      title: `Rank histograms of ${options.name}, ${bins} bins, one row per chain`,
      data: { quantity: options.name },
    },
    inner,
  );
}

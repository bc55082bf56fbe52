/**
 * A data-and-model panel: data points with one-sigma error bars per group (each
 * group its own colour and marker shape), a bounded number of posterior model
 * draws as thin lines over them, and optionally the residuals in a panel below
 * on the same x axis.
 */
import { type Axis, drawBottomAxis, drawLeftAxis, makeAxis } from '../axes.js';
import { evenIndices, minMaxDownsample } from '../downsample.js';
import type { FitGroup, FitPanel } from '../input.js';
import { ink, seriesColour } from '../palette.js';
import { type Domain, padDomain } from '../scale.js';
import { type Box, bottom, element, points, px, right, svgDocument, text } from '../svg.js';
import { groupShape, markerPath } from './markers.js';

export interface FitPanelOptions {
  /** Model draws drawn at most (default 40), evenly chosen among those given. */
  maxModelDraws?: number;
  /** Points per model curve (default 240), min/max per bin so dips are kept. */
  curvePoints?: number;
  /** Data points drawn per group at most (default 4000), evenly chosen. */
  maxDataPoints?: number;
  width?: number;
}

function grow(domain: [number, number], lo: number, hi: number): void {
  if (lo < domain[0]) domain[0] = lo;
  if (hi > domain[1]) domain[1] = hi;
}

function groupExtent(groups: readonly FitGroup[], domainX: [number, number], domainY: [number, number]): void {
  for (const g of groups) {
    for (let i = 0; i < g.x.length; i++) {
      const e = g.yErr ? g.yErr[i] : 0;
      grow(domainX, g.x[i], g.x[i]);
      grow(domainY, g.y[i] - e, g.y[i] + e);
    }
  }
}

function drawGroups(groups: readonly FitGroup[], xAxis: Axis, yAxis: Axis, maxDataPoints: number, part: string): string {
  let out = '';
  groups.forEach((g, k) => {
    const keep = evenIndices(g.x.length, maxDataPoints);
    const colour = seriesColour(k);
    if (g.yErr) {
      let d = '';
      for (const i of keep) {
        const x = px(xAxis.scale(g.x[i]));
        d += `M${x} ${px(yAxis.scale(g.y[i] - g.yErr[i]))}V${px(yAxis.scale(g.y[i] + g.yErr[i]))}`;
      }
      if (d) out += element('path', { class: `${part}-errors`, d, stroke: colour, 'stroke-opacity': keep.length > 300 ? 0.3 : 0.55, 'stroke-width': 1, fill: 'none' });
    }
    // Dense groups get lighter markers so the model lines over them stay readable.
    const dense = keep.length > 300;
    let d = '';
    for (const i of keep) d += markerPath(groupShape(k), xAxis.scale(g.x[i]), yAxis.scale(g.y[i]), 2.6);
    if (d) {
      out += element('path', {
        class: `${part}-points`,
        'data-group': g.label,
        d,
        fill: colour,
        'fill-opacity': dense ? 0.45 : 0.85,
        stroke: '#ffffff',
        'stroke-width': 0.4,
      });
    }
  });
  return out;
}

/** The legend row: one marker and label per group, then the model lines. */
function legend(panel: FitPanel, modelCount: number, totalModel: number, maxDataPoints: number, x0: number, y: number): string {
  let out = '';
  let x = x0;
  panel.groups.forEach((g, k) => {
    out += element('path', { d: markerPath(groupShape(k), x + 4, y - 4, 3.2), fill: seriesColour(k) });
    const thinned = g.x.length > maxDataPoints ? ` (${maxDataPoints} of ${g.x.length} shown)` : '';
    const label = `${g.label}${thinned}`;
    out += text(x + 12, y, label, { class: 'legend-label' });
    x += 22 + label.length * 6.2;
  });
  if (modelCount > 0) {
    out += element('path', { d: `M${px(x)} ${px(y - 4)}h18`, stroke: ink.model, 'stroke-width': 1.2 });
    const label = modelCount < totalModel ? `model, ${modelCount} of ${totalModel} posterior draws` : `model, ${modelCount} posterior draws`;
    out += text(x + 24, y, label, { class: 'legend-label' });
  }
  return element('g', { class: 'legend' }, out);
}

/** A fit panel as a standalone <svg> (data-plot="fit"). */
export function fitPanel(panel: FitPanel, options: FitPanelOptions = {}): string {
  const width = options.width ?? 555;
  const maxModel = options.maxModelDraws ?? 40;
  const curvePoints = options.curvePoints ?? 240;
  const maxData = options.maxDataPoints ?? 4000;
  const hasResiduals = (panel.residuals?.length ?? 0) > 0;
  const legendHeight = 24;
  const main: Box = { left: 76, top: 10 + legendHeight, width: width - 76 - 14, height: 230 };
  const residualBox: Box = { left: main.left, top: bottom(main) + 10, width: main.width, height: 96 };
  const height = (hasResiduals ? bottom(residualBox) : bottom(main)) + 46;

  const allModel = panel.modelDraws ?? [];
  const chosen = evenIndices(allModel.length, maxModel).map((i) => allModel[i]);
  const dx: [number, number] = [Infinity, -Infinity];
  const dy: [number, number] = [Infinity, -Infinity];
  groupExtent(panel.groups, dx, dy);
  for (const m of chosen) {
    for (let i = 0; i < m.x.length; i++) {
      grow(dx, m.x[i], m.x[i]);
      grow(dy, m.y[i], m.y[i]);
    }
  }
  const xDomain = padDomain(dx[0] <= dx[1] ? (dx as Domain) : undefined, 0.02);
  const yDomain = padDomain(dy[0] <= dy[1] ? (dy as Domain) : undefined, 0.05);
  const xAxis = makeAxis(xDomain, [main.left, right(main)], panel.xLabel, panel.xUnit, 7);
  const yAxis = makeAxis(yDomain, [bottom(main), main.top], panel.yLabel, panel.yUnit, 5);

  let out = legend(panel, chosen.length, allModel.length, maxData, main.left, 10 + 14);
  out += element('rect', { x: main.left, y: main.top, width: main.width, height: main.height, fill: 'none', stroke: ink.grid });
  out += drawLeftAxis(main, yAxis, { grid: true });
  out += drawGroups(panel.groups, xAxis, yAxis, maxData, 'data');
  // Model lines over the data, so they stay visible over dense light curves.
  const opacity = Math.max(0.12, Math.min(0.6, 4 / Math.max(1, chosen.length)));
  for (const m of chosen) {
    const d = minMaxDownsample(m.y, curvePoints);
    const xs = Float64Array.from(d.index, (i) => xAxis.scale(m.x[i]));
    const ys = d.value.map(yAxis.scale);
    out += element('polyline', {
      class: 'model-draw',
      points: points(xs, ys),
      fill: 'none',
      stroke: ink.model,
      'stroke-width': 0.9,
      'stroke-opacity': opacity,
    });
  }

  if (hasResiduals && panel.residuals) {
    out += drawBottomAxis(main, xAxis, { labels: false, title: false, grid: false });
    const ry: [number, number] = [0, 0];
    const rx: [number, number] = [xDomain[0], xDomain[1]];
    groupExtent(panel.residuals, rx, ry);
    const m = Math.max(Math.abs(ry[0]), Math.abs(ry[1]));
    const rAxis = makeAxis(padDomain([-m, m], 0.08), [bottom(residualBox), residualBox.top], 'residual', panel.yUnit, 3);
    out += element('rect', { x: residualBox.left, y: residualBox.top, width: residualBox.width, height: residualBox.height, fill: 'none', stroke: ink.grid });
    out += drawLeftAxis(residualBox, rAxis, { grid: true });
    out += element('path', {
      class: 'residual-zero',
      d: `M${px(residualBox.left)} ${px(rAxis.scale(0))}H${px(right(residualBox))}`,
      stroke: ink.model,
      'stroke-dasharray': '4 3',
      fill: 'none',
    });
    out += drawGroups(panel.residuals, xAxis, rAxis, maxData, 'residual');
    out += drawBottomAxis(residualBox, xAxis, { grid: false });
  } else {
    out += drawBottomAxis(main, xAxis, {});
  }
  return svgDocument(
    {
      kind: 'fit',
      width,
      height,
      title: `${panel.title}: ${panel.groups.length} data groups, ${chosen.length} model draws${hasResiduals ? ', residuals below' : ''}`,
    },
    out,
  );
}

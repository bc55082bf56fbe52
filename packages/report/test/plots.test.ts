import { describe, expect, it } from 'vitest';
import { chainValuePlot, fitPanel, pairPlot, rankPlot, tracePlot, treeDepthPlot } from '../src/index.js';
import { checkXml, countClass, polylinePointCounts } from './xmlCheck.js';
import { normalStream, syntheticInput } from './synthetic.js';

const normal = normalStream(3);
const chains = Array.from({ length: 3 }, () => Float64Array.from({ length: 50_000 }, () => normal()));

describe('tracePlot', () => {
  it('draws one bounded polyline per chain and one tick per divergent pixel column', () => {
    const divergent = chains.map(() => new Uint8Array(50_000));
    divergent[1][123] = 1;
    divergent[2][40_000] = 1;
    const svg = tracePlot({ name: 'x', unit: 'm/s', chains, divergent, maxPoints: 500 });
    expect(checkXml(svg).ok).toBe(true);
    const counts = polylinePointCounts(svg, 'trace-line');
    expect(counts.length).toBe(3);
    for (const c of counts) {
      expect(c).toBeGreaterThanOrEqual(250);
      expect(c).toBeLessThanOrEqual(500);
    }
    expect(countClass(svg, 'divergent-marks')).toBe(1);
    const marks = /class="divergent-marks" d="([^"]+)"/.exec(svg)![1];
    expect(marks.match(/M/g)!.length).toBe(2);
    expect(svg).toContain('x [m/s]');
    expect(svg.length).toBeLessThan(60_000);
  });
  it('has no divergence marks when there are none', () => {
    expect(countClass(tracePlot({ name: 'x', chains }), 'divergent-marks')).toBe(0);
  });
});

describe('rankPlot', () => {
  it('draws one histogram path per chain with the requested bins', () => {
    const svg = rankPlot({ name: 'x', chains, bins: 12 });
    expect(checkXml(svg).ok).toBe(true);
    expect(countClass(svg, 'rank-bars')).toBe(3);
    const first = /class="rank-bars" data-chain="1" d="([^"]+)"/.exec(svg)![1];
    expect(first.match(/H/g)!.length).toBe(12); // one horizontal run per bin
  });
});

describe('pairPlot', () => {
  const pooled = [0, 1, 2, 3].map(() => Float64Array.from({ length: 20_000 }, () => normal()));
  it('has k(k−1)/2 scatter cells, k histograms, and bounded points', () => {
    const divergent = new Uint8Array(20_000);
    for (let i = 0; i < 20_000; i += 97) divergent[i] = 1;
    const svg = pairPlot({ names: ['a', 'b', 'c', 'd'], pooled, divergent, maxPoints: 300 });
    expect(checkXml(svg).ok).toBe(true);
    expect(countClass(svg, 'pair-points')).toBe(6);
    expect(countClass(svg, 'pair-histogram')).toBe(4);
    expect(countClass(svg, 'pair-divergent')).toBe(6);
    expect(countClass(svg, 'correlation')).toBe(6);
    const pts = /class="pair-points" d="([^"]+)"/.exec(svg)![1];
    expect(pts.match(/M/g)!.length).toBe(300);
    const crosses = /class="pair-divergent" d="([^"]+)"/.exec(svg)![1];
    expect(crosses.match(/M/g)!.length).toBe(Math.min(150, Math.ceil(20_000 / 97)));
  });
  it('shows a correlation close to the true one (Fisher 1915: sd of r ≈ (1 − ρ²)/√n)', () => {
    const x = Float64Array.from({ length: 10_000 }, () => normal());
    const y = x.map((v) => 0.8 * v + 0.6 * normal()); // ρ = 0.8
    const svg = pairPlot({ names: ['x', 'y'], pooled: [x, y] });
    const r = Number(/r = ([0-9.]+)/.exec(svg)![1]);
    expect(Math.abs(r - 0.8)).toBeLessThan(4 * (0.36 / 100) + 0.005); // 4 sd plus rounding to 2 decimals
  });
});

describe('fitPanel', () => {
  const [rv, transit] = syntheticInput({ draws: 20 }).fits!;
  it('draws at most maxModelDraws model lines, one marker path per group, and residuals', () => {
    const svg = fitPanel(rv, { maxModelDraws: 25 });
    expect(checkXml(svg).ok).toBe(true);
    expect(polylinePointCounts(svg, 'model-draw').length).toBe(25);
    expect(countClass(svg, 'data-points')).toBe(2);
    expect(countClass(svg, 'data-errors')).toBe(2);
    expect(countClass(svg, 'residual-points')).toBe(2);
    expect(countClass(svg, 'residual-zero')).toBe(1);
    expect(svg).toContain('radial velocity [m/s]');
    expect(svg).toContain('residual [m/s]');
  });
  it('bounds model curve points and keeps the transit’s lowest point', () => {
    const svg = fitPanel(transit, { curvePoints: 100 });
    const counts = polylinePointCounts(svg, 'model-draw');
    expect(counts.length).toBe(30);
    for (const c of counts) expect(c).toBeLessThanOrEqual(100);
  });
  it('has no residual panel when none is given', () => {
    const svg = fitPanel({ ...rv, residuals: undefined });
    expect(countClass(svg, 'residual-points')).toBe(0);
    expect(countClass(svg, 'data-points')).toBe(2);
  });
});

describe('health plots', () => {
  it('flags a chain below the reference in words', () => {
    const svg = chainValuePlot({
      kind: 'health-ebfmi',
      label: 'E-BFMI',
      values: [0.9, 0.2, undefined],
      reference: { value: 0.3, label: '0.3', flag: 'below', flagText: 'LOW' },
    });
    expect(checkXml(svg).ok).toBe(true);
    expect(countClass(svg, 'value-dot')).toBe(2);
    expect(svg.match(/LOW/g)!.length).toBe(1);
    expect(svg).toContain('not recorded');
  });
  it('draws tree depth shares and the limit', () => {
    const svg = treeDepthPlot({ chains: [[1, 2, 2, 3], [3, 3, 10, 2]], maxTreeDepth: 10 });
    expect(checkXml(svg).ok).toBe(true);
    const bars = /class="depth-bars" d="([^"]+)"/.exec(svg)![1];
    expect(bars.match(/M/g)!.length).toBe(4); // depths 1, 2, 3, 10 occur
    expect(svg).toContain('limit 10');
  });
});

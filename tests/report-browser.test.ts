/**
 * The report opened in headless Chromium: every plot must render with real
 * geometry, the page must load nothing from the network and run no script, and
 * a screenshot is kept in artifacts/ for people to look at.
 *
 * Needs Debian's chromium at /usr/bin/chromium (CI installs it in .ci/run). Outside
 * CI the test is skipped, with a message, when the browser is absent; under CI it
 * always runs, so a missing browser fails.
 */
import { existsSync } from 'node:fs';
import { mkdir } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium, type Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { writeReport } from '@apsis/report';
import { syntheticInput } from '../packages/report/test/synthetic.js';

const CHROMIUM = '/usr/bin/chromium';
const available = existsSync(CHROMIUM);
const mustRun = Boolean(process.env.CI);
const run = available || mustRun;
if (!run) {
  console.warn(`report-browser.test.ts skipped: ${CHROMIUM} not found (install it with: apt-get install -y chromium). Under CI this test always runs.`);
}

const artifacts = fileURLToPath(new URL('../artifacts/', import.meta.url));

interface PlotInfo {
  kind: string;
  width: number;
  height: number;
  parsesAsSvg: boolean;
  /** Data elements (paths and polylines that carry a data class) and how many have geometry. */
  dataElements: number;
  dataWithGeometry: number;
  emptyData: number;
}

interface Collected {
  plots: PlotInfo[];
  scripts: number;
  headings: string[];
  title: string;
}

/**
 * Runs inside the page (as text, since the project compiles without DOM types):
 * for each svg.plot, its size, whether its markup parses as SVG on its own, and
 * its data elements (paths, polylines and dots with a data class) with geometry.
 */
const COLLECT = `(() => {
  const dataClasses = ['trace-line', 'rank-bars', 'pair-points', 'pair-histogram', 'pair-divergent', 'model-draw',
    'data-points', 'data-errors', 'residual-points', 'value-dot', 'depth-bars', 'divergent-marks'];
  const selector = dataClasses.map((c) => '.' + c).join(',');
  const plots = [];
  for (const svg of document.querySelectorAll('svg.plot')) {
    const box = svg.getBoundingClientRect();
    const parsed = new DOMParser().parseFromString(svg.outerHTML, 'image/svg+xml');
    let withGeometry = 0;
    let empty = 0;
    const data = svg.querySelectorAll(selector);
    for (const el of data) {
      const raw = el.getAttribute('d') ?? el.getAttribute('points') ?? (el.tagName === 'circle' ? 'c' : '');
      if (raw.trim() === '') empty++;
      const b = el.getBBox();
      // A dot or a vertical tick has zero width or zero height, never both.
      if (b.width > 0 || b.height > 0) withGeometry++;
    }
    plots.push({
      kind: svg.getAttribute('data-plot') ?? '',
      width: box.width,
      height: box.height,
      parsesAsSvg: parsed.getElementsByTagName('parsererror').length === 0,
      dataElements: data.length,
      dataWithGeometry: withGeometry,
      emptyData: empty,
    });
  }
  const headings = Array.from(document.querySelectorAll('.quantity h3')).map((h) => h.textContent ?? '');
  return { plots, scripts: document.scripts.length, headings, title: document.title };
})()`;

describe.runIf(run)('report in headless Chromium', () => {
  // playwright-core's launch() gives every browser a fresh temporary profile.
  let browser: Browser;
  const names = ['period', 'K', 'eccentricity', 'offset A', '<script>alert("x")</script>', 'mass'];
  const input = syntheticInput({ seed: 424242, chains: 4, draws: 3000, names });
  input.quantities.units = { ...input.quantities.units, '<script>alert("x")</script>': 'm/s' };

  beforeAll(async () => {
    browser = await chromium.launch({
      executablePath: CHROMIUM,
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
        '--disable-quic',
      ],
    });
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('renders every plot with geometry, loads nothing and runs no script', async () => {
    await mkdir(artifacts, { recursive: true });
    const path = await writeReport(input, join(artifacts, 'report-browser'));
    const page = await browser.newPage({ viewport: { width: 1280, height: 900 } });
    const requests: string[] = [];
    const problems: string[] = [];
    page.on('request', (r) => {
      if (!r.url().startsWith('file:')) requests.push(r.url());
    });
    page.on('console', (m) => {
      if (m.type() === 'error' || m.type() === 'warning') problems.push(m.text());
    });
    page.on('pageerror', (e) => problems.push(String(e)));
    await page.goto(pathToFileURL(path).href, { waitUntil: 'load' });

    const result = (await page.evaluate(COLLECT)) as Collected;

    expect(requests).toEqual([]);
    expect(problems).toEqual([]);
    expect(result.scripts).toBe(0);
    // the hostile name is shown as text, not run
    expect(result.headings).toContain('<script>alert("x")</script> [m/s]');

    const byKind = new Map<string, PlotInfo[]>();
    for (const p of result.plots) byKind.set(p.kind, [...(byKind.get(p.kind) ?? []), p]);
    const count = (k: string) => byKind.get(k)?.length ?? 0;
    expect(count('trace')).toBe(names.length);
    expect(count('rank')).toBe(names.length);
    expect(count('pair')).toBe(1);
    expect(count('fit')).toBe(2);
    for (const k of ['health-ebfmi', 'health-treedepth', 'health-stepsize', 'health-acceptance']) expect(count(k)).toBe(1);
    expect(result.plots.length).toBe(2 * names.length + 1 + 2 + 4);

    // Data elements per plot kind: chains per trace (plus the divergence ticks),
    // chains per rank plot, 10 scatter + 5 histograms + 10 divergence layers in a
    // 5-quantity pair plot, model draws + markers + error bars (+ residuals) per fit.
    const expectedData: Record<string, (p: PlotInfo) => boolean> = {
      trace: (p) => p.dataElements === 4 + 1,
      rank: (p) => p.dataElements === 4,
      pair: (p) => p.dataElements === 10 + 5 + 10,
      fit: (p) => p.dataElements === 40 + 2 * 2 + 2 || p.dataElements === 30 + 2 + 1,
      'health-ebfmi': (p) => p.dataElements === 4,
      'health-stepsize': (p) => p.dataElements === 4,
      'health-acceptance': (p) => p.dataElements === 4,
      'health-treedepth': (p) => p.dataElements === 1,
    };
    for (const p of result.plots) {
      expect(p.parsesAsSvg, `${p.kind} parses as SVG`).toBe(true);
      expect(p.width, `${p.kind} width`).toBeGreaterThan(100);
      expect(p.height, `${p.kind} height`).toBeGreaterThan(50);
      expect(p.emptyData, `${p.kind} empty path data`).toBe(0);
      expect(p.dataWithGeometry, `${p.kind} elements with geometry`).toBe(p.dataElements);
      expect(expectedData[p.kind](p), `${p.kind} has ${p.dataElements} data elements`).toBe(true);
    }

    await page.screenshot({ path: join(artifacts, 'report-browser.png'), fullPage: true });
    await page.close();
  });
});

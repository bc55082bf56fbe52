import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { renderReport, writeReport } from '../src/index.js';
import { checkXml, polylinePointCounts, svgElements } from './xmlCheck.js';
import { syntheticInput } from './synthetic.js';

const input = syntheticInput({ draws: 400 });
const html = renderReport(input);

describe('renderReport', () => {
  it('is well-formed, and so is every plot on its own', () => {
    const page = checkXml(html, { html: true });
    expect(page.error).toBeUndefined();
    for (const svg of svgElements(html)) expect(checkXml(svg).ok).toBe(true);
  });
  it('has the expected plots by kind', () => {
    const names = input.quantities.names.length;
    expect(svgElements(html, 'trace').length).toBe(names);
    expect(svgElements(html, 'rank').length).toBe(names);
    expect(svgElements(html, 'pair').length).toBe(1);
    expect(svgElements(html, 'fit').length).toBe(2);
    for (const kind of ['health-ebfmi', 'health-treedepth', 'health-stepsize', 'health-acceptance']) {
      expect(svgElements(html, kind).length).toBe(1);
    }
  });
  it('pairs the first five quantities by default, or those asked for', () => {
    expect((svgElements(html, 'pair')[0].match(/class="pair-histogram"/g) ?? []).length).toBe(5);
    const two = renderReport({ ...input, pairs: ['K', 'mass'] });
    expect((svgElements(two, 'pair')[0].match(/class="pair-histogram"/g) ?? []).length).toBe(2);
  });
  it('loads nothing from elsewhere and runs no script', () => {
    const withoutNamespaces = html.replaceAll('xmlns="http://www.w3.org/2000/svg"', '');
    expect(/https?:|\/\/[a-z]/i.test(withoutNamespaces), 'URL in page').toBe(false);
    expect(/<script|<link|<img|<iframe|@import|url\(|src=/i.test(html), 'external resource').toBe(false);
    expect(html.includes("default-src 'none'"), 'content security policy').toBe(true);
  });
  it('escapes hostile names, units, titles and warnings', () => {
    const evil = '<script>alert(1)</script>';
    const hostile = syntheticInput({ draws: 40, chains: 2, names: [evil, 'b" onload="x', 'c'] });
    hostile.title = `${evil} & title`;
    hostile.quantities.units = { [evil]: evil };
    hostile.warnings = [{ severity: 'problem', message: evil, advice: evil, quantity: evil }];
    hostile.fits![0].groups[0].label = evil;
    hostile.fits![0].title = evil;
    hostile.run.notes = [evil];
    const out = renderReport(hostile);
    expect(out.includes('<script'), 'raw <script').toBe(false);
    expect(out.includes('" onload="'), 'attribute break-out').toBe(false);
    expect(out.includes('&lt;script&gt;alert(1)&lt;/script&gt;'), 'escaped name').toBe(true);
    expect(checkXml(out, { html: true }).error).toBeUndefined();
  });
  it('flags problems in words, not only in colour', () => {
    const flagged = syntheticInput({ draws: 300, names: ['a', 'b'] });
    const row = { mean: 0, sd: 1, q05: -1.6, q50: 0, q95: 1.6, mcseMean: 0.05 };
    flagged.summary = [
      { name: 'a', ...row, essBulk: 2000, essTail: 1800, rhat: 1.002 },
      { name: 'b', ...row, essBulk: 150, essTail: 1800, rhat: 1.04 },
    ];
    const out = renderReport(flagged);
    const rows = out.match(/<tr class="flagged" data-quantity="[^"]+">/g) ?? [];
    expect(rows).toEqual(['<tr class="flagged" data-quantity="b">']);
    expect(out.includes('CHECK</span>R-hat 1.040 &gt; 1.01; bulk ESS 150 &lt; 400'), 'flag text').toBe(true);
    expect(out.includes('1 of 2 quantities flagged for R-hat or ESS (b)'), 'verdict text').toBe(true);
  });
  it('computes R-hat and ESS with @apsis/diagnostics and flags a chain that sits apart', () => {
    // One chain shifted by 6 posterior sds: R-hat far above 1.01 (Vehtari et al. 2021).
    const out = renderReport(syntheticInput({ draws: 300, stuckShift: 6, names: ['a', 'b'] }));
    // (boolean checks: a failure should not print the whole page)
    expect(out.includes('could not be computed'), 'diagnostics resolved').toBe(false);
    expect(out.match(/<tr class="flagged" data-quantity="[^"]+">/g)?.length).toBe(2);
    expect(/CHECK<\/span>R-hat 1\.[1-9][0-9]* &gt; 1.01/.test(out), 'R-hat flag in words').toBe(true);
  });
  it('renders degenerate runs: one chain of one draw, constant quantities, no statistics', () => {
    const tiny = renderReport({
      title: 'tiny',
      run: { seed: 'abc', chains: 1, warmup: 0, draws: 1, method: 'HMC' },
      quantities: { names: ['a'], chains: [[2.5]] },
    });
    expect(checkXml(tiny, { html: true }).error).toBeUndefined();
    expect(svgElements(tiny, 'trace').length).toBe(1);
    expect(svgElements(tiny, 'pair').length).toBe(0);
    expect(svgElements(tiny).some((s) => s.includes('NaN') || s.includes('Infinity'))).toBe(false);
    const flat = renderReport({
      title: 'constant',
      run: { seed: 1, chains: 2, warmup: 10, draws: 20, method: 'NUTS' },
      quantities: { names: ['c', 'd'], chains: [new Float64Array(40).fill(1), Float64Array.from({ length: 40 }, (_, i) => (i % 2 ? 1 : i))] },
    });
    expect(checkXml(flat, { html: true }).error).toBeUndefined();
    expect(svgElements(flat).some((s) => s.includes('NaN') || s.includes('Infinity'))).toBe(false);
    expect(svgElements(flat, 'pair').length).toBe(1);
  });
  it('computes warnings with @apsis/diagnostics when none are passed in', () => {
    const auto = syntheticInput({ draws: 300, names: ['a', 'b'], divergentRate: 0.01 });
    delete auto.warnings;
    const out = renderReport(auto);
    expect(out.includes('Computed by @apsis/diagnostics'), 'source named').toBe(true);
    // divergent draws are a problem, draws at the depth limit a caution (shown as WARNING)
    expect(/<li class="problem"><span class="badge problem">PROBLEM<\/span>[^<]*diverg/i.test(out), 'divergence problem').toBe(true);
    expect(/<li class="warning"><span class="badge warning">WARNING<\/span>[^<]*depth/i.test(out), 'tree-depth caution').toBe(true);
  });
  it('accepts the diagnostics package’s own warning objects', () => {
    const given = syntheticInput({ draws: 40, chains: 2, names: ['a', 'b'] });
    given.warnings = [
      { code: 'ebfmi-low', severity: 'caution', quantity: null, chain: 1, value: 0.2, threshold: 0.3, message: 'Low E-BFMI.', advice: 'Reparameterise.' },
    ];
    const out = renderReport(given);
    expect(out.includes('<span class="badge warning">WARNING</span>Low E-BFMI.<span class="advice">What to do: Reparameterise.</span>')).toBe(true);
  });
  it('keeps a 1e5-draw run small: bounded polylines and file size', () => {
    const big = syntheticInput({ draws: 100_000, chains: 4, names: ['period', 'K', 'eccentricity'] });
    const out = renderReport(big);
    for (const svg of svgElements(out, 'trace')) {
      for (const n of polylinePointCounts(svg, 'trace-line')) expect(n).toBeLessThanOrEqual(600);
    }
    expect(out.length).toBeLessThan(700_000);
  });
});

describe('writeReport', () => {
  const dirs: string[] = [];
  afterAll(async () => {
    for (const d of dirs) await rm(d, { recursive: true, force: true });
  });
  it('writes report.html into the folder, creating it, and leaves no temporary file', async () => {
    const root = await mkdtemp(join(tmpdir(), 'apsis-report-'));
    dirs.push(root);
    const folder = join(root, 'run-1', 'nested');
    const path = await writeReport(input, folder);
    expect(path).toBe(join(folder, 'report.html'));
    expect((await readFile(path, 'utf8')) === html, 'file holds the rendered page').toBe(true);
    expect(await readdir(folder)).toEqual(['report.html']);
    // a second write replaces the file whole
    const other = { ...input, title: 'Second' };
    await writeReport(other, folder);
    expect((await readFile(path, 'utf8')).includes('<title>Second</title>'), 'file replaced').toBe(true);
    expect(await readdir(folder)).toEqual(['report.html']);
  });
});

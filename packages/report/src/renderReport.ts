/**
 * The whole report as one HTML document: inline CSS, inline SVG, no scripts and
 * no external resources, so it opens anywhere without a network.
 */
import { escapeText } from './escape.js';
import { formatCount, formatFixed, formatToScale } from './format.js';
import { stylesheet } from './html/css.js';
import { chainLegend } from './html/legend.js';
import { runTable } from './html/runTable.js';
import { samplerTable } from './html/samplerTable.js';
import { summaryTable } from './html/summaryTable.js';
import { warningsList } from './html/warningsList.js';
import type { ReportInput, ReportWarning, SummaryRow, ValidReportInput } from './input.js';
import { chainValuePlot } from './plots/chainValuePlot.js';
import { fitPanel } from './plots/fitPanel.js';
import { pairPlot } from './plots/pairPlot.js';
import { rankPlot } from './plots/rankPlot.js';
import { tracePlot } from './plots/tracePlot.js';
import { treeDepthPlot } from './plots/treeDepthPlot.js';
import { type ChainHealth, chainHealth } from './stats/chainHealth.js';
import { columnOfChains, flags, pool } from './stats/columns.js';
import { EBFMI_THRESHOLD, summaryFlags } from './stats/flags.js';
import { computeWarnings, summarise } from './stats/summarise.js';
import { validateReportInput } from './validate.js';

/** Default number of quantities in the pair plot when `pairs` is not given. */
export const DEFAULT_PAIR_COUNT = 5;

/** A heading with an anchor the contents line links to. */
function section(id: string, title: string, body: string): string {
  return `<section id="${id}"><h2>${escapeText(title)}</h2>\n${body}\n</section>`;
}

function unitSuffix(unit: string | undefined): string {
  return unit ? ` [${unit}]` : '';
}

interface Verdict {
  html: string;
  flaggedQuantities: number;
}

function verdict(summary: readonly SummaryRow[], health: readonly ChainHealth[], input: ValidReportInput, warningsShown: readonly ReportWarning[], missing: string | undefined): Verdict {
  const chains = input.run.chains;
  const items: string[] = [];
  const flagged = summary.filter((r) => summaryFlags(r, chains).length > 0);
  if (flagged.length > 0) {
    const names = flagged.slice(0, 6).map((r) => r.name).join(', ');
    items.push(`${flagged.length} of ${summary.length} quantities flagged for R-hat or ESS (${names}${flagged.length > 6 ? ', …' : ''})`);
  }
  const divergent = health.reduce((s, h) => s + (h.divergences ?? 0), 0);
  if (divergent > 0) items.push(`${divergent} divergent draws`);
  const atLimit = health.reduce((s, h) => s + (h.depthLimitHits ?? 0), 0);
  if (atLimit > 0) items.push(`${atLimit} draws at the tree-depth limit`);
  const lowEnergy = health.filter((h) => h.ebfmi !== undefined && h.ebfmi < EBFMI_THRESHOLD).length;
  if (lowEnergy > 0) items.push(`E-BFMI below ${EBFMI_THRESHOLD} in ${lowEnergy} chain${lowEnergy > 1 ? 's' : ''}`);
  const problems = warningsShown.filter((w) => w.severity === 'problem').length;
  const warnings = warningsShown.filter((w) => w.severity === 'warning').length;
  const listed = [problems > 0 ? `${problems} problem${problems > 1 ? 's' : ''}` : '', warnings > 0 ? `${warnings} warning${warnings > 1 ? 's' : ''}` : '']
    .filter(Boolean)
    .join(' and ');
  if (listed) items.push(`${listed} listed under Warnings`);

  let html = items.length
    ? `<p class="verdict"><span class="badge warning">CHECK</span>${escapeText(items.join('; '))}.</p>`
    : '<p class="verdict"><span class="badge ok">NO FLAGS</span>None of the checks in this report raised a flag.</p>';
  if (missing) html += `<p class="caution">${escapeText(missing)} Their columns are empty and were not checked.</p>`;
  html +=
    '<p class="caution">Diagnostics can show that something went wrong; they cannot prove that the chains converged. ' +
    'The posterior, and every number below, depends on the model and the priors stated for it.</p>';
  return { html, flaggedQuantities: flagged.length };
}

function healthSection(input: ValidReportInput, health: readonly ChainHealth[]): string {
  const stats = input.stats ?? [];
  const plots: string[] = [];
  if (health.some((h) => h.ebfmi !== undefined)) {
    plots.push(
      chainValuePlot({
        kind: 'health-ebfmi',
        label: 'E-BFMI',
        values: health.map((h) => h.ebfmi),
        reference: { value: EBFMI_THRESHOLD, label: String(EBFMI_THRESHOLD), flag: 'below', flagText: 'LOW' },
      }),
    );
  }
  if (stats.some((s) => s.treeDepth)) {
    plots.push(treeDepthPlot({ chains: stats.map((s) => s.treeDepth ?? []), maxTreeDepth: input.run.maxTreeDepth }));
  }
  if (health.some((h) => h.stepSize !== undefined)) {
    plots.push(chainValuePlot({ kind: 'health-stepsize', label: 'step size (unconstrained)', values: health.map((h) => h.stepSize) }));
  }
  if (health.some((h) => h.meanAcceptance !== undefined)) {
    const target = input.run.targetAcceptance;
    plots.push(
      chainValuePlot({
        kind: 'health-acceptance',
        label: 'mean acceptance',
        values: health.map((h) => h.meanAcceptance),
        domain: [0, 1],
        reference: target === undefined ? undefined : { value: target, label: `target ${target}`, flag: 'none', flagText: '' },
      }),
    );
  }
  const caption =
    '<figcaption>E-BFMI: energy Bayesian fraction of missing information of each chain (Betancourt 2016); below 0.3 the ' +
    'momentum resampling explores the energy poorly. Tree depth: share of draws at each depth, all chains; draws at the limit ' +
    'had their trajectories cut short. Step size: median per chain, in the sampler’s unconstrained coordinates.</figcaption>';
  return `<figure><div class="figure-row">${plots.join('\n')}</div>${caption}</figure>\n${samplerTable(health)}`;
}

function quantityCard(name: string, unit: string | undefined, row: SummaryRow | undefined, trace: string, rank: string, chains: number): string {
  let numbers = '';
  if (row) {
    const flags = summaryFlags(row, chains);
    numbers =
      `mean ${formatToScale(row.mean, row.sd)} ± ${formatToScale(row.sd, row.sd)}${unit ? ` ${escapeText(unit)}` : ''}` +
      ` · R-hat ${formatFixed(row.rhat, 3)} · bulk ESS ${formatCount(row.essBulk)} · tail ESS ${formatCount(row.essTail)}` +
      (flags.length ? ` <span class="badge warning">CHECK</span>${escapeText(flags.join('; '))}` : '');
  }
  return (
    `<div class="quantity" data-quantity="${escapeText(name)}"><h3>${escapeText(name + unitSuffix(unit))}</h3>` +
    `<p class="numbers">${numbers}</p><div class="figures">${trace}${rank}</div></div>`
  );
}

/**
 * Renders the report. Validates the input first (throws ReportInputError naming
 * the field); computes the summary and the warnings with @apsis/diagnostics when
 * they are not given.
 */
export function renderReport(raw: ReportInput): string {
  const input = validateReportInput(raw);
  const { names, chains } = input.quantities;
  const units = input.quantities.units ?? {};
  const dim = names.length;
  const rows = chains[0].length / dim;
  const byQuantity = names.map((_, j) => columnOfChains(chains, dim, j));
  const divergent = input.stats?.map((s) => (s.divergent ? flags(s.divergent, rows) : undefined));
  const limits = input.limits ?? {};

  // The summary and the warnings are computed only when not supplied.
  const computed = !input.summary || !input.warnings ? summarise(names, byQuantity) : undefined;
  const summary: SummaryRow[] = input.summary ?? computed?.rows ?? [];
  const missing = input.summary ? undefined : computed?.missing;
  const warningsComputed = !input.warnings;
  const warnings: ReportWarning[] =
    input.warnings ?? (computed?.table ? computeWarnings(computed.table, input.stats, input.run.maxTreeDepth) : []);
  const health = chains.map((_, c) => chainHealth(input.stats?.[c], rows, input.run.maxTreeDepth));
  const createdAt = input.createdAt instanceof Date ? input.createdAt.toISOString() : input.createdAt;
  const check = verdict(summary, health, input, warnings, missing);

  const parts: string[] = [];
  parts.push(section('checks', 'Checks at a glance', check.html));
  parts.push(
    section(
      'warnings',
      'Warnings',
      `<p class="caution">${warningsComputed ? 'Computed by @apsis/diagnostics from the draws and sampler statistics.' : 'As passed in with the run.'}</p>` +
        warningsList(warnings),
    ),
  );
  parts.push(section('run', 'Run', runTable(input.run, rows, createdAt)));
  parts.push(
    section(
      'summary',
      'Summary',
      summaryTable(summary, units, input.run.chains) +
        `<p class="caution">Quantiles and sd over all chains pooled. Flags: R-hat above 1.01, bulk or tail ESS below 100 per chain ` +
        `(${100 * input.run.chains} here), after Vehtari et al. (2021).</p>`,
    ),
  );
  if (input.stats) parts.push(section('sampler', 'Sampler health', healthSection(input, health)));

  if (input.fits && input.fits.length > 0) {
    const panels = input.fits
      .map(
        (panel) =>
          `<figure class="fit"><h3>${escapeText(panel.title)}</h3>${fitPanel(panel, {
            maxModelDraws: limits.modelDraws,
            curvePoints: limits.curvePoints,
            maxDataPoints: limits.dataPoints,
          })}</figure>`,
      )
      .join('\n');
    parts.push(
      section(
        'fits',
        'Data and model',
        `<div class="figure-row">${panels}</div><p class="caution">Error bars are one sigma as given with the data. Grey lines are posterior draws of the model, ` +
          'not a confidence band. Residuals are data minus model as supplied with the run.</p>',
      ),
    );
  }

  const pairNames = input.pairs ?? names.slice(0, DEFAULT_PAIR_COUNT);
  if (pairNames.length >= 2) {
    const pooledDivergent = divergent && divergent.some((d) => d) ? pool(divergent.map((d) => d ?? new Uint8Array(rows))) : undefined;
    const plot = pairPlot({
      names: pairNames,
      units,
      pooled: pairNames.map((n) => pool(byQuantity[names.indexOf(n)])),
      divergent: pooledDivergent ? Uint8Array.from(pooledDivergent) : undefined,
      maxPoints: limits.pairPoints,
    });
    parts.push(
      section(
        'pairs',
        'Pairs',
        `<figure>${plot}<figcaption>Below the diagonal: draws of one quantity against another, all chains pooled and thinned evenly; ` +
          'divergent draws as crosses (×). Diagonal: histograms. Above: Pearson correlation r of the pooled draws.</figcaption></figure>',
      ),
    );
  }

  const hasDivergences = health.some((h) => (h.divergences ?? 0) > 0);
  const rowByName = new Map(summary.map((r) => [r.name, r]));
  const cards = names
    .map((name, j) =>
      quantityCard(
        name,
        units[name],
        rowByName.get(name),
        tracePlot({ name, unit: units[name], chains: byQuantity[j], divergent, maxPoints: limits.tracePoints }),
        rankPlot({ name, chains: byQuantity[j], bins: limits.rankBins }),
        input.run.chains,
      ),
    )
    .join('\n');
  parts.push(
    section(
      'chains',
      'Chains',
      chainLegend(input.run.chains, hasDivergences) +
        '<p class="caution">Left: trace of every chain after warmup (long chains are drawn with each bin’s smallest and largest ' +
        'draw, so spikes stay visible). Right: rank plot (Vehtari et al. 2021): the draws of all chains are ranked together and ' +
        'each chain’s ranks are counted in bins. Flat rows mean the chains agree; the grey band is where 99 % of bins fall for ' +
        'independent draws, the dashed line the expected count.</p>' +
        cards,
    ),
  );

  const contents = [
    ['checks', 'checks'],
    ['warnings', 'warnings'],
    ['run', 'run'],
    ['summary', 'summary'],
    ...(input.stats ? [['sampler', 'sampler health']] : []),
    ...(input.fits?.length ? [['fits', 'data and model']] : []),
    ...(pairNames.length >= 2 ? [['pairs', 'pairs']] : []),
    ['chains', 'chains'],
  ]
    .map(([id, label]) => `<a href="#${id}">${label}</a>`)
    .join('');

  const meta = [
    `${input.run.method}, ${input.run.chains} chains × ${rows} draws`,
    `seed ${String(input.run.seed)}`,
    ...(createdAt ? [createdAt] : []),
  ].join(' · ');
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">
<title>${escapeText(input.title)}</title>
<style>${stylesheet}</style>
</head>
<body>
<main>
<header class="page"><h1>${escapeText(input.title)}</h1>${input.subtitle ? `<p class="subtitle">${escapeText(input.subtitle)}</p>` : ''}
<p class="meta">${escapeText(meta)}</p>
<nav class="contents">${contents}</nav></header>
${parts.join('\n')}
<footer>Report written by apsis. Self-contained: no scripts, fonts or files are loaded from anywhere else.</footer>
</main>
</body>
</html>
`;
}

import { describe, expect, it } from 'vitest';
import {
  bulkEss,
  CONSTANT_NOTE,
  essOfMean,
  formatSummaryText,
  mcseOfMean,
  quantileOfSorted,
  sortedCopy,
  splitRhat,
  splitRhatBulk,
  splitRhatFolded,
  summarize,
  summarizeDraws,
  summarizeQuantity,
  summaryCsvColumns,
  summaryToCsv,
  summaryToJson,
  tailEss,
} from '../src/index.js';
import { ar1Chain, chainsOf, createRandom, normalDraws } from './support/random.js';

const rng = createRandom(51);
const good = chainsOf(4, () => ar1Chain(rng, 1000, 0.6).map((v) => 3.2 + 1e-6 * v));
const constant = chainsOf(4, () => new Float64Array(1000).fill(7.25));
const stuck = chainsOf(4, (c) => new Float64Array(1000).fill(c));

describe('summary table', () => {
  it('each row agrees with the standalone functions (same draws, same definitions)', () => {
    const row = summarizeQuantity('period', good);
    const pooled = sortedCopy(Float64Array.from(good.flatMap((c) => Array.from(c))));
    expect(row.rhat).toBe(splitRhat(good));
    expect(row.rhatBulk).toBe(splitRhatBulk(good));
    expect(row.rhatFolded).toBe(splitRhatFolded(good));
    expect(row.bulkEss).toBe(bulkEss(good));
    expect(row.tailEss).toBe(tailEss(good));
    expect(row.essMean).toBe(essOfMean(good));
    expect(row.mcseMean).toBe(mcseOfMean(good));
    expect(row.median).toBe(quantileOfSorted(pooled, 0.5));
    expect(row.quantiles.map((q) => q.probability)).toEqual([0.05, 0.5, 0.95]);
    expect(row.quantiles[0].value).toBe(quantileOfSorted(pooled, 0.05));
    expect(row.notes).toEqual([]);
    // mean and sd over all draws (two-pass, divisor S - 1)
    const mean = pooled.reduce((s, v) => s + v, 0) / pooled.length;
    expect(Math.abs(row.mean / mean - 1)).toBeLessThan(1e-14);
    expect(row.sd).toBeCloseTo(Math.sqrt(pooled.reduce((s, v) => s + (v - mean) ** 2, 0) / (pooled.length - 1)), 18);
  });

  it('uses the requested quantile levels', () => {
    const row = summarizeQuantity('x', good, { quantiles: [0.025, 0.975] });
    expect(row.quantiles.map((q) => q.probability)).toEqual([0.025, 0.975]);
  });

  it('a constant quantity reads "undefined (constant)": null values, never NaN, in data, text, CSV and JSON', () => {
    const table = summarize({ period: good, fixed: constant, stuck });
    const fixed = table.rows[1];
    expect(fixed).toMatchObject({ rhat: null, bulkEss: null, tailEss: null, mcseMean: 0, sd: 0, mean: 7.25 });
    expect(fixed.notes).toEqual([CONSTANT_NOTE]);
    expect(table.rows[2].rhat).toBeNull();
    expect(table.rows[2].notes[0]).toMatch(/R-hat infinite/);
    const text = formatSummaryText(table);
    const csv = summaryToCsv(table);
    const json = summaryToJson(table);
    for (const out of [text, csv, json]) {
      expect(out).not.toMatch(/NaN/);
      expect(out).not.toMatch(/Infinity/);
    }
    expect(text).toContain('undefined (constant)');
    expect(text).toMatch(/stuck .* infinite/);
    const parsed = JSON.parse(json);
    expect(parsed.format).toBe('apsis-diagnostics-summary');
    expect(parsed.quantities[1].rhat).toBeNull();
    expect(parsed.quantities[1].notes).toEqual(['undefined (constant)']);
  });

  it('the text table is aligned: every line of the table has the same width and the columns line up', () => {
    const text = formatSummaryText(summarize({ period: good, 'a rather long name': constant }));
    const lines = text.split('\n');
    const header = lines.findIndex((l) => l.startsWith('quantity'));
    const body = lines.slice(header, header + 4);
    expect(new Set(body.map((l) => l.length)).size).toBe(1);
    const rhatColumn = body[0].indexOf('R-hat') + 'R-hat'.length;
    for (const l of body.slice(2)) expect(l.length).toBe(rhatColumn);
  });

  it('CSV has the documented columns, one row per quantity, and numbers that parse back exactly', () => {
    const table = summarize({ 'period, days': good, fixed: constant });
    const lines = summaryToCsv(table).trimEnd().split('\n');
    expect(lines[0]).toBe(summaryCsvColumns([0.05, 0.5, 0.95]).join(','));
    expect(lines[0]).toBe(
      'quantity,mean,std_dev,median,quantile_0.05,quantile_0.5,quantile_0.95,mean_mc_error,bulk_eff_draws,tail_eff_draws,eff_draws_of_mean,split_r_hat,split_r_hat_bulk,split_r_hat_folded,notes',
    );
    expect(lines).toHaveLength(3);
    expect(lines[1].startsWith('"period, days",')).toBe(true);
    const fields = lines[1].slice('"period, days",'.length).split(',');
    expect(Number(fields[0])).toBe(table.rows[0].mean);
    expect(Number(fields[10])).toBe(table.rows[0].rhat);
    const fixed = lines[2].split(',');
    expect(fixed[10]).toBe(''); // split_r_hat of the constant quantity: empty, not NaN
    expect(fixed[14]).toBe('undefined (constant)');
  });

  it('summarizeDraws reads column j of each row-major draws x dim matrix as quantity j', () => {
    const chains = 3;
    const n = 200;
    const dim = 11; // more than one group of eight columns, the last one partial
    const columns = Array.from({ length: dim }, (_, j) => chainsOf(chains, () => normalDraws(rng, n).map((v) => 10 * j + v)));
    const matrices = Array.from({ length: chains }, (_, c) => {
      const m = new Float64Array(n * dim);
      for (let i = 0; i < n; i++) for (let j = 0; j < dim; j++) m[i * dim + j] = columns[j][c][i];
      return m;
    });
    const names = columns.map((_, j) => `q${j}`);
    const fromMatrix = summarizeDraws(matrices, { dim, names });
    const direct = summarize(names.map((name, j) => ({ name, chains: columns[j] })));
    expect(fromMatrix.rows).toEqual(direct.rows);
    expect(summarizeDraws(matrices, { dim }).rows.map((r) => r.name).slice(0, 2)).toEqual(['x[0]', 'x[1]']);
  });

  it('unequal chain lengths are cut to the shortest, with a notice in the result', () => {
    const uneven = [good[0], good[1].subarray(0, 900), good[2]];
    const table = summarize({ period: uneven });
    expect(table.drawsPerChain).toBe(900);
    expect(table.notices).toHaveLength(1);
    expect(table.notices[0]).toMatchObject({ code: 'chains-truncated', severity: 'caution', quantity: 'period', value: 900 });
    expect(table.rows[0].rhat).toBe(splitRhat(uneven.map((c) => c.subarray(0, 900))));
    expect(formatSummaryText(table)).toMatch(/different lengths \(1000, 900, 1000\)/);
  });

  it('a trace whose chains differ in length gives one notice for all its quantities', () => {
    const matrices = [new Float64Array(3 * 40).map(() => rng.normal()), new Float64Array(3 * 30).map(() => rng.normal())];
    const table = summarizeDraws(matrices, { dim: 3 });
    expect(table.drawsPerChain).toBe(30);
    expect(table.notices).toHaveLength(1);
    expect(table.notices[0]).toMatchObject({ code: 'chains-truncated', quantity: null, value: 30 });
    expect(table.notices[0].message).toMatch(/^The chains of every quantity have different lengths \(40, 30\)/);
  });
});

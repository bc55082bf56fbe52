import { describe, expect, it } from 'vitest';
import { ReportInputError, type ReportInput, validateReportInput } from '../src/index.js';
import { syntheticInput } from './synthetic.js';

function issuesOf(input: unknown): string[] {
  try {
    validateReportInput(input);
  } catch (e) {
    expect(e).toBeInstanceOf(ReportInputError);
    return (e as ReportInputError).issues.map((i) => `${i.field}: ${i.message}`);
  }
  throw new Error('expected a ReportInputError');
}

const base = (): ReportInput => syntheticInput({ draws: 40, chains: 2, names: ['a', 'b'] });

describe('validateReportInput', () => {
  it('accepts the synthetic input and maps severity words', () => {
    const input = base();
    input.warnings = [{ severity: 'error' as never, message: 'm' }];
    expect(validateReportInput(input).warnings![0].severity).toBe('problem');
  });
  it('names a missing field', () => {
    const input = base() as Partial<ReportInput>;
    delete input.title;
    expect(issuesOf(input).join('\n')).toMatch(/^title: /);
  });
  it('rejects unknown top-level fields (typos)', () => {
    expect(issuesOf({ ...base(), fit: [] }).join('\n')).toMatch(/fit/);
  });
  it('names the chain, draw and quantity of a non-finite value', () => {
    const input = base();
    (input.quantities.chains[1] as Float64Array)[7] = Number.NaN;
    expect(issuesOf(input)).toEqual(['quantities.chains[1][7]: is NaN (quantity "b", draw 3); expected a finite number']);
  });
  it('checks chain counts and lengths against each other', () => {
    const input = base();
    input.run.chains = 3;
    input.quantities.chains[1] = new Float64Array(41);
    const issues = issuesOf(input);
    expect(issues).toContain('quantities.chains: has 2 chains; expected run.chains = 3');
    expect(issues).toContain('quantities.chains[1]: has length 41, not a multiple of names.length = 2');
  });
  it('checks statistics lengths and ranges', () => {
    const input = base();
    input.stats![0].energy = new Float64Array(39);
    input.stats![1].acceptance = new Float64Array(40).fill(1.5);
    input.stats![1].divergent = new Float64Array(40).fill(2);
    const issues = issuesOf(input);
    expect(issues).toContain('stats[0].energy: has length 39; expected 40 (one entry per draw)');
    expect(issues).toContain('stats[1].acceptance[0]: is 1.5; expected a probability in [0, 1]');
    expect(issues).toContain('stats[1].divergent[0]: is 2; expected 0, 1, true or false');
  });
  it('checks pair names, fit arrays and duplicate names', () => {
    const input = base();
    input.pairs = ['a', 'nope'];
    input.fits![0].groups[0].yErr = new Float64Array(input.fits![0].groups[0].x.length).fill(-1);
    input.fits![1].modelDraws![0] = { x: [0, 1], y: [1] };
    input.quantities.names = ['a', 'a'];
    const issues = issuesOf(input);
    expect(issues).toContain('pairs[1]: "nope" is not one of quantities.names');
    expect(issues).toContain('fits[0].groups[0].yErr[0]: is -1; expected a non-negative error bar');
    expect(issues).toContain('fits[1].modelDraws[0].y: has length 1; expected 2 (same as fits[1].modelDraws[0].x)');
    expect(issues).toContain('quantities.names[1]: "a" appears twice; expected unique names');
  });
  it('rejects wrong types with the field path', () => {
    const input = base() as unknown as Record<string, unknown>;
    (input.quantities as Record<string, unknown>).chains = ['x'];
    expect(issuesOf(input).join('\n')).toMatch(/^quantities\.chains\[0\]: expected an array of numbers/);
  });
});

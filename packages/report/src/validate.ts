/**
 * Input checking for the report. Shapes are checked with zod; lengths, finiteness
 * and cross-references (chains vs run.chains, pair names vs quantity names) are
 * checked after. Every problem is reported with the field's path.
 */
import { z } from 'zod';
import type { FitGroup, ValidReportInput } from './input.js';

/** One problem with a report input: the field's path and what was expected. */
export interface InputIssue {
  field: string;
  message: string;
}

/** Thrown when a report input is malformed; `issues` lists every problem found. */
export class ReportInputError extends Error {
  readonly issues: InputIssue[];
  constructor(issues: InputIssue[]) {
    const shown = issues.slice(0, 12).map((i) => `  - ${i.field}: ${i.message}`);
    if (issues.length > 12) shown.push(`  … and ${issues.length - 12} more`);
    super(`Invalid report input:\n${shown.join('\n')}`);
    this.name = 'ReportInputError';
    this.issues = issues;
  }
}

function isNumberArray(value: unknown): boolean {
  if (Array.isArray(value)) return value.every((v) => typeof v === 'number');
  return ArrayBuffer.isView(value) && !(value instanceof DataView) && !(value instanceof BigInt64Array) && !(value instanceof BigUint64Array);
}

const numberArray = z.custom<ArrayLike<number>>(isNumberArray, {
  message: 'expected an array of numbers or a typed array',
});

const flagArray = z.custom<ArrayLike<number> | boolean[]>(
  (v) => isNumberArray(v) || (Array.isArray(v) && v.every((x) => typeof x === 'boolean')),
  { message: 'expected an array of 0/1 numbers, booleans, or a typed array' },
);

const finite = z.number().refine(Number.isFinite, { message: 'expected a finite number' });
const positiveInt = z.number().int().positive();
const nonNegativeInt = z.number().int().nonnegative();

const severity = z.preprocess(
  (v) => (typeof v === 'string' ? (SEVERITY_ALIASES[v.toLowerCase()] ?? v) : v),
  z.enum(['note', 'warning', 'problem']),
);

/** Other common severity words accepted and mapped onto the three levels. */
const SEVERITY_ALIASES: Record<string, string> = {
  info: 'note',
  information: 'note',
  notice: 'note',
  warn: 'warning',
  caution: 'warning',
  error: 'problem',
  critical: 'problem',
  severe: 'problem',
};

const fitGroup = z.object({
  label: z.string(),
  x: numberArray,
  y: numberArray,
  yErr: numberArray.optional(),
});

const schema = z.strictObject({
  title: z.string(),
  subtitle: z.string().optional(),
  createdAt: z.union([z.string(), z.date()]).optional(),
  run: z.object({
    seed: z.union([z.number(), z.string()]),
    chains: positiveInt,
    warmup: nonNegativeInt,
    draws: nonNegativeInt,
    method: z.string(),
    metric: z.string().optional(),
    backend: z.string().optional(),
    elapsedSeconds: finite.pipe(z.number().nonnegative()).optional(),
    maxTreeDepth: positiveInt.optional(),
    targetAcceptance: z.number().gt(0).lt(1).optional(),
    notes: z.array(z.string()).optional(),
  }),
  quantities: z.object({
    names: z.array(z.string()).min(1),
    units: z.record(z.string(), z.string()).optional(),
    chains: z.array(numberArray).min(1),
  }),
  stats: z
    .array(
      z.object({
        divergent: flagArray.optional(),
        treeDepth: numberArray.optional(),
        energy: numberArray.optional(),
        stepSize: numberArray.optional(),
        acceptance: numberArray.optional(),
        leapfrogSteps: numberArray.optional(),
      }),
    )
    .optional(),
  summary: z
    .array(
      z.object({
        name: z.string(),
        mean: finite,
        sd: finite.pipe(z.number().nonnegative()),
        q05: finite,
        q50: finite,
        q95: finite,
        mcseMean: finite.optional(),
        essBulk: finite.optional(),
        essTail: finite.optional(),
        rhat: finite.optional(),
      }),
    )
    .optional(),
  warnings: z
    .array(
      z.object({
        severity,
        message: z.string(),
        advice: z.string().optional(),
        quantity: z.string().nullable().optional(),
      }),
    )
    .optional(),
  pairs: z.array(z.string()).optional(),
  fits: z
    .array(
      z.object({
        title: z.string(),
        xLabel: z.string(),
        xUnit: z.string().optional(),
        yLabel: z.string(),
        yUnit: z.string().optional(),
        groups: z.array(fitGroup).min(1),
        modelDraws: z.array(z.object({ x: numberArray, y: numberArray })).optional(),
        residuals: z.array(fitGroup).optional(),
      }),
    )
    .optional(),
  limits: z
    .strictObject({
      tracePoints: z.number().int().min(4).optional(),
      pairPoints: positiveInt.optional(),
      modelDraws: nonNegativeInt.optional(),
      curvePoints: z.number().int().min(4).optional(),
      dataPoints: positiveInt.optional(),
      rankBins: z.number().int().min(2).optional(),
    })
    .optional(),
});

function pathText(path: readonly PropertyKey[]): string {
  let out = '';
  for (const p of path) {
    if (typeof p === 'number') out += `[${p}]`;
    else out += out ? `.${String(p)}` : String(p);
  }
  return out || '(input)';
}

function describe(value: number): string {
  return Number.isNaN(value) ? 'NaN' : String(value);
}

/** Index of the first non-finite entry, or -1. */
function firstNonFinite(a: ArrayLike<number>): number {
  for (let i = 0; i < a.length; i++) if (!Number.isFinite(a[i])) return i;
  return -1;
}

type Check = (field: string, message: string) => void;

function checkLength(check: Check, field: string, a: ArrayLike<unknown>, expected: number, what: string): boolean {
  if (a.length !== expected) {
    check(field, `has length ${a.length}; expected ${expected} (${what})`);
    return false;
  }
  return true;
}

function checkFinite(check: Check, field: string, a: ArrayLike<number>): boolean {
  const i = firstNonFinite(a);
  if (i >= 0) {
    check(`${field}[${i}]`, `is ${describe(a[i])}; expected a finite number`);
    return false;
  }
  return true;
}

function checkRange(check: Check, field: string, a: ArrayLike<number>, ok: (v: number) => boolean, expected: string): void {
  for (let i = 0; i < a.length; i++) {
    if (!ok(a[i])) {
      check(`${field}[${i}]`, `is ${describe(a[i])}; expected ${expected}`);
      return;
    }
  }
}

function checkConsistency(input: ValidReportInput, check: Check): void {
  const { names, chains } = input.quantities;
  const dim = names.length;
  const seen = new Set<string>();
  names.forEach((n, i) => {
    if (seen.has(n)) check(`quantities.names[${i}]`, `"${n}" appears twice; expected unique names`);
    seen.add(n);
  });
  if (chains.length !== input.run.chains) {
    check('quantities.chains', `has ${chains.length} chains; expected run.chains = ${input.run.chains}`);
  }
  let rows = -1;
  chains.forEach((c, k) => {
    const field = `quantities.chains[${k}]`;
    if (c.length % dim !== 0) {
      check(field, `has length ${c.length}, not a multiple of names.length = ${dim}`);
      return;
    }
    const r = c.length / dim;
    if (r < 1) check(field, 'has no draws; expected at least 1');
    if (rows < 0) rows = r;
    else if (r !== rows) check(field, `has ${r} draws; expected ${rows} like quantities.chains[0]`);
    const bad = firstNonFinite(c);
    if (bad >= 0) {
      const name = names[bad % dim];
      check(`${field}[${bad}]`, `is ${describe(c[bad])} (quantity "${name}", draw ${Math.floor(bad / dim)}); expected a finite number`);
    }
  });
  if (input.stats) {
    if (input.stats.length !== chains.length) {
      check('stats', `has ${input.stats.length} entries; expected one per chain (${chains.length})`);
    }
    input.stats.forEach((s, k) => {
      const base = `stats[${k}]`;
      const want = chains[k] ? chains[k].length / dim : rows;
      for (const key of ['treeDepth', 'energy', 'stepSize', 'acceptance', 'leapfrogSteps'] as const) {
        const a = s[key];
        if (!a) continue;
        const field = `${base}.${key}`;
        if (!checkLength(check, field, a, want, 'one entry per draw') || !checkFinite(check, field, a)) continue;
        if (key === 'acceptance') checkRange(check, field, a, (v) => v >= 0 && v <= 1, 'a probability in [0, 1]');
        if (key === 'stepSize') checkRange(check, field, a, (v) => v > 0, 'a positive step size');
        if (key === 'treeDepth' || key === 'leapfrogSteps') {
          checkRange(check, field, a, (v) => v >= 0 && Number.isInteger(v), 'a non-negative integer');
        }
      }
      if (s.divergent) {
        const field = `${base}.divergent`;
        if (checkLength(check, field, s.divergent, want, 'one entry per draw')) {
          const d = s.divergent;
          for (let i = 0; i < d.length; i++) {
            const v = d[i];
            if (!(typeof v === 'boolean' || v === 0 || v === 1)) {
              check(`${field}[${i}]`, `is ${String(v)}; expected 0, 1, true or false`);
              break;
            }
          }
        }
      }
    });
  }
  input.pairs?.forEach((p, i) => {
    if (!seen.has(p)) check(`pairs[${i}]`, `"${p}" is not one of quantities.names`);
  });
  input.fits?.forEach((panel, f) => {
    const groups = (key: 'groups' | 'residuals', list: FitGroup[]) => {
      list.forEach((g, j) => {
        const base = `fits[${f}].${key}[${j}]`;
        if (!checkLength(check, `${base}.y`, g.y, g.x.length, `same as ${base}.x`)) return;
        checkFinite(check, `${base}.x`, g.x);
        checkFinite(check, `${base}.y`, g.y);
        if (g.yErr && checkLength(check, `${base}.yErr`, g.yErr, g.x.length, `same as ${base}.x`) && checkFinite(check, `${base}.yErr`, g.yErr)) {
          checkRange(check, `${base}.yErr`, g.yErr, (v) => v >= 0, 'a non-negative error bar');
        }
      });
    };
    groups('groups', panel.groups);
    if (panel.residuals) groups('residuals', panel.residuals);
    panel.modelDraws?.forEach((m, j) => {
      const base = `fits[${f}].modelDraws[${j}]`;
      if (!checkLength(check, `${base}.y`, m.y, m.x.length, `same as ${base}.x`)) return;
      if (m.x.length < 2) check(`${base}.x`, `has ${m.x.length} points; expected at least 2`);
      checkFinite(check, `${base}.x`, m.x);
      checkFinite(check, `${base}.y`, m.y);
    });
  });
}

/**
 * Checks a report input (a ReportInput) and returns it with warnings normalised.
 * Throws ReportInputError listing every problem, each with its field path.
 */
export function validateReportInput(input: unknown): ValidReportInput {
  const parsed = schema.safeParse(input);
  if (!parsed.success) {
    throw new ReportInputError(parsed.error.issues.map((i) => ({ field: pathText(i.path), message: i.message })));
  }
  const value = parsed.data as ValidReportInput;
  const issues: InputIssue[] = [];
  checkConsistency(value, (field, message) => issues.push({ field, message }));
  if (issues.length > 0) throw new ReportInputError(issues);
  return value;
}

import { CONSTANT_NOTE, summarize, type NamedChains } from '@apsis/diagnostics';
import { z } from 'zod';
import { RunOptionsError } from './errors.js';

/**
 * When a run that draws until converged stops. R-hat is the larger of bulk and folded
 * rank-normalised split R-hat; ESS are bulk and tail ESS over all chains (Vehtari et
 * al. 2021, Bayesian Analysis 16, 667). Checks run after `firstCheck` draws per chain
 * and then whenever the draws per chain have grown by `growth` (at least `minBlock`).
 */
export interface ConvergenceCriteria {
  /** Every checked quantity needs R-hat below this (default 1.01). */
  rhatBelow?: number;
  /** Every checked quantity needs bulk ESS at least this, summed over chains (default 400). */
  minBulkEss?: number;
  /** Every checked quantity needs tail ESS at least this, summed over chains (default 400). */
  minTailEss?: number;
  /** Stop at this many draws per chain even if not converged (default 10000). */
  maxDraws?: number;
  /** Stop once this many seconds of wall-clock time have passed (checked at each check; default: no limit). */
  maxSeconds?: number;
  /** Draws per chain at the first check (default 100; at least 8). */
  firstCheck?: number;
  /** Relative growth of the draws per chain between checks (default 0.1). */
  growth?: number;
  /** Fewest draws per chain between checks (default 50). */
  minBlock?: number;
  /**
   * Names of the quantities to check (output names, or coordinate names). Default:
   * the target's outputs when it has them, else its coordinates.
   */
  quantities?: readonly string[];
}

/** Criteria with every field filled in, as stored in a run folder's manifest. */
export interface ResolvedConvergenceCriteria {
  readonly rhatBelow: number;
  readonly minBulkEss: number;
  readonly minTailEss: number;
  readonly maxDraws: number;
  /** null: no time limit. */
  readonly maxSeconds: number | null;
  readonly firstCheck: number;
  readonly growth: number;
  readonly minBlock: number;
  /** null: the default choice of quantities. */
  readonly quantities: readonly string[] | null;
}

const criteriaExpected: Record<keyof ConvergenceCriteria, string> = {
  rhatBelow: 'a number > 1 (e.g. 1.01)',
  minBulkEss: 'a number >= 0',
  minTailEss: 'a number >= 0',
  maxDraws: 'an integer from 8 to 1e9',
  maxSeconds: 'a number > 0 (seconds)',
  firstCheck: 'an integer >= 8',
  growth: 'a number > 0 and <= 10',
  minBlock: 'an integer >= 1',
  quantities: 'an array of quantity names',
};

/** Zod schema of stored (resolved) criteria. */
export const resolvedCriteriaSchema = z.strictObject({
  rhatBelow: z.number().gt(1).finite(),
  minBulkEss: z.number().min(0).finite(),
  minTailEss: z.number().min(0).finite(),
  maxDraws: z.number().int().min(8).max(1e9),
  maxSeconds: z.number().gt(0).finite().nullable(),
  firstCheck: z.number().int().min(8).max(1e9),
  growth: z.number().gt(0).max(10),
  minBlock: z.number().int().min(1).max(1e9),
  quantities: z.array(z.string().max(500)).max(100000).nullable(),
});

const inputSchema = resolvedCriteriaSchema
  .extend({ maxSeconds: z.number().gt(0).finite(), quantities: z.array(z.string().max(500)).max(100000) })
  .partial();

/** Validates criteria and fills in defaults. Throws {@link RunOptionsError} naming the field. */
export function resolveConvergenceCriteria(input: unknown): ResolvedConvergenceCriteria {
  const value = input === true ? {} : input;
  const parsed = inputSchema.safeParse(value);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    if (issue.code === 'unrecognized_keys') {
      throw new RunOptionsError(`option \`untilConverged\`: unknown field ${issue.keys.map((k) => `\`${k}\``).join(', ')}; known: ${Object.keys(criteriaExpected).join(', ')}`);
    }
    const key = String(issue.path[0] ?? '') as keyof ConvergenceCriteria;
    if (key === ('' as never)) throw new RunOptionsError(`option \`untilConverged\` = ${JSON.stringify(value)}: expected true or an object of criteria`);
    const bad = (value as Record<string, unknown>)[key];
    throw new RunOptionsError(`option \`untilConverged.${key}\` = ${JSON.stringify(bad)}: expected ${criteriaExpected[key] ?? issue.message}`);
  }
  const c = parsed.data;
  const resolved: ResolvedConvergenceCriteria = {
    rhatBelow: c.rhatBelow ?? 1.01,
    minBulkEss: c.minBulkEss ?? 400,
    minTailEss: c.minTailEss ?? 400,
    maxDraws: c.maxDraws ?? 10000,
    maxSeconds: c.maxSeconds ?? null,
    firstCheck: c.firstCheck ?? 100,
    growth: c.growth ?? 0.1,
    minBlock: c.minBlock ?? 50,
    quantities: c.quantities ?? null,
  };
  if (resolved.firstCheck > resolved.maxDraws) {
    throw new RunOptionsError(
      `option \`untilConverged.firstCheck\` = ${resolved.firstCheck}: expected at most untilConverged.maxDraws = ${resolved.maxDraws}`,
    );
  }
  return resolved;
}

/**
 * The draws per chain at which checks happen: `firstCheck`, then each time
 * `max(minBlock, ceil(growth × draws))` more, ending at `maxDraws`. A fixed function of
 * the criteria, so an interrupted and resumed run checks at the same points. With
 * growth g the checks cost about (1 + 1/g) times one final full computation.
 */
export function checkPoints(criteria: ResolvedConvergenceCriteria): number[] {
  const out: number[] = [];
  let d = criteria.firstCheck;
  for (;;) {
    out.push(d);
    if (d >= criteria.maxDraws) return out;
    d = Math.min(criteria.maxDraws, d + Math.max(criteria.minBlock, Math.ceil(criteria.growth * d)));
  }
}

/** How one quantity fared at a check. */
export interface QuantityConvergence {
  readonly name: string;
  /** Larger of bulk and folded rank-normalised split R-hat; null when undefined. */
  readonly rhat: number | null;
  readonly bulkEss: number | null;
  readonly tailEss: number | null;
  /** Every draw identical: nothing to estimate, counted as passing. */
  readonly constant: boolean;
  readonly passes: boolean;
}

/** The outcome of one convergence check. */
export interface ConvergenceAssessment {
  readonly drawsPerChain: number;
  /** True when every checked quantity passes. */
  readonly converged: boolean;
  readonly quantities: QuantityConvergence[];
  /** One plain sentence per failing quantity, worst R-hat first. */
  readonly failures: string[];
}

const round = (x: number | null, digits: number): string => (x === null ? 'undefined' : x.toFixed(digits));

/**
 * Checks every quantity of `quantities` (one array of draws per chain each) against
 * the criteria, with a full recomputation of R-hat and bulk- and tail-ESS by
 * `@apsis/diagnostics`' `summarize`.
 */
export function assessConvergence(quantities: readonly NamedChains[], criteria: ResolvedConvergenceCriteria): ConvergenceAssessment {
  const table = summarize(quantities);
  const rows: QuantityConvergence[] = table.rows.map((r) => {
    const constant = r.notes.includes(CONSTANT_NOTE);
    const passes =
      constant ||
      (r.rhat !== null &&
        r.rhat < criteria.rhatBelow &&
        r.bulkEss !== null &&
        r.bulkEss >= criteria.minBulkEss &&
        r.tailEss !== null &&
        r.tailEss >= criteria.minTailEss);
    return { name: r.name, rhat: r.rhat, bulkEss: r.bulkEss, tailEss: r.tailEss, constant, passes };
  });
  const failing = rows.filter((r) => !r.passes).sort((a, b) => (b.rhat ?? Infinity) - (a.rhat ?? Infinity));
  const failures = failing.map((r) => {
    const why: string[] = [];
    if (r.rhat === null || r.rhat >= criteria.rhatBelow) why.push(`R-hat ${round(r.rhat, 3)} (needs < ${criteria.rhatBelow})`);
    if (r.bulkEss === null || r.bulkEss < criteria.minBulkEss) why.push(`bulk ESS ${round(r.bulkEss, 0)} (needs >= ${criteria.minBulkEss})`);
    if (r.tailEss === null || r.tailEss < criteria.minTailEss) why.push(`tail ESS ${round(r.tailEss, 0)} (needs >= ${criteria.minTailEss})`);
    return `${r.name}: ${why.join(', ')}`;
  });
  return { drawsPerChain: table.drawsPerChain, converged: failing.length === 0, quantities: rows, failures };
}

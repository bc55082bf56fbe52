import { OptionError, ChainShapeError } from './errors.js';
import { diagnoseQuantity, type QuantityDiagnostics } from './quantityDiagnostics.js';
import { prepareChains, requireSplittable, type ChainsInput } from './validateChains.js';
import { createDiagnosticsWorkspace, type DiagnosticsWorkspace } from './workspace.js';
import type { DiagnosticWarning } from './warningTypes.js';
import { z } from 'zod';

/**
 * Summary table: one row per scalar quantity with its mean, sd, median, chosen quantiles,
 * MCSE of the mean, bulk- and tail-ESS and rank-normalised split R-hat. Plain data with no
 * NaN: undefined values are null and `notes` says why.
 */

/** Default quantile probabilities: 5%, 50%, 95%. */
export const DEFAULT_QUANTILES: readonly number[] = [0.05, 0.5, 0.95];

/** Note used when every draw of a quantity is identical. */
export const CONSTANT_NOTE = 'undefined (constant)';

export interface SummaryOptions {
  /** Probabilities of the quantile columns, each in (0, 1); default 5%, 50%, 95%. */
  quantiles?: readonly number[];
}

/** One row of the summary. Units: those of the quantity (ESS in draws, R-hat dimensionless). */
export interface QuantitySummary {
  readonly name: string;
  readonly mean: number;
  /** Standard deviation over all draws (divisor S - 1). */
  readonly sd: number;
  readonly median: number;
  readonly quantiles: { readonly probability: number; readonly value: number }[];
  /** Monte Carlo standard error of the mean (null when undefined). */
  readonly mcseMean: number | null;
  readonly bulkEss: number | null;
  readonly tailEss: number | null;
  /** Classic ESS of the mean (used by mcseMean). */
  readonly essMean: number | null;
  /** Larger of bulk and folded rank-normalised split R-hat. */
  readonly rhat: number | null;
  readonly rhatBulk: number | null;
  readonly rhatFolded: number | null;
  /** Why values are missing, in plain words (empty when all are defined). */
  readonly notes: string[];
}

export interface SummaryTable {
  /** Number of chains (of the first quantity; see `rows` for each). */
  readonly chains: number;
  /** Draws per chain used (after truncation to the shortest chain). */
  readonly drawsPerChain: number;
  readonly quantileLevels: number[];
  readonly rows: QuantitySummary[];
  /** Findings about the input itself (e.g. chains truncated to a common length). */
  readonly notices: DiagnosticWarning[];
}

const quantilesSchema = z.array(z.number().gt(0).lt(1)).min(1);

function checkQuantiles(options: SummaryOptions | undefined): number[] {
  const q = options?.quantiles ?? DEFAULT_QUANTILES;
  const parsed = quantilesSchema.safeParse(q);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    const at = issue.path.length > 0 ? `options.quantiles[${String(issue.path[0])}]` : 'options.quantiles';
    const bad = issue.path.length > 0 && Array.isArray(q) ? (q as unknown[])[Number(issue.path[0])] : q;
    throw new OptionError(at, `${at}: expected ${issue.path.length > 0 ? 'a probability strictly between 0 and 1' : 'a non-empty array of probabilities'}, got ${JSON.stringify(bad)}`);
  }
  return [...parsed.data];
}

function finite(x: number): number | null {
  return Number.isFinite(x) ? x : null;
}

function rowOf(name: string, d: QuantityDiagnostics, levels: number[]): QuantitySummary {
  const notes: string[] = [];
  if (d.constant) notes.push(CONSTANT_NOTE);
  else {
    if (d.rhat === Infinity) notes.push('R-hat infinite (each chain is stuck at its own constant value)');
    else if (Number.isNaN(d.rhat)) notes.push('R-hat undefined');
    if (!Number.isFinite(d.bulkEss) && d.rhat !== Infinity) notes.push('bulk ESS undefined');
    if (!Number.isFinite(d.tailEss) && d.rhat !== Infinity) notes.push('tail ESS undefined (a tail indicator does not vary within the split chains)');
  }
  return {
    name,
    mean: d.mean,
    sd: d.sd,
    median: d.median,
    quantiles: levels.map((probability, i) => ({ probability, value: d.quantiles[i] })),
    mcseMean: finite(d.mcseMean),
    bulkEss: finite(d.bulkEss),
    tailEss: finite(d.tailEss),
    essMean: finite(d.essMean),
    rhat: finite(d.rhat),
    rhatBulk: finite(d.rhatBulk),
    rhatFolded: finite(d.rhatFolded),
    notes,
  };
}

function truncationNotice(names: readonly string[], all: boolean, lengths: number[], used: number): DiagnosticWarning {
  const which = all ? (names.length === 1 ? `'${names[0]}'` : 'every quantity') : names.map((n) => `'${n}'`).join(', ');
  return {
    code: 'chains-truncated',
    severity: 'caution',
    quantity: names.length === 1 ? names[0] : null,
    chain: null,
    value: used,
    threshold: null,
    message: `The chains of ${which} have different lengths (${lengths.join(', ')}); every chain was cut to the shortest, ${used} draws.`,
    advice: 'Check why some chains stopped early (a crash, a time limit, a worker lost); rerun or discard the short chains so that no draws are wasted.',
  };
}

/** Caches one workspace per (chains, draws) shape across the quantities of a summary. */
class WorkspaceCache {
  private readonly map = new Map<string, DiagnosticsWorkspace>();
  get(chains: number, draws: number): DiagnosticsWorkspace {
    const key = `${chains}x${draws}`;
    let ws = this.map.get(key);
    if (ws === undefined) {
      ws = createDiagnosticsWorkspace(chains, draws);
      this.map.set(key, ws);
    }
    return ws;
  }
}

/** A named quantity's draws, one array per chain. */
export interface NamedChains {
  readonly name: string;
  readonly chains: ChainsInput;
}

function normalise(input: unknown): NamedChains[] {
  if (Array.isArray(input)) {
    return input.map((entry, i) => {
      if (entry === null || typeof entry !== 'object' || typeof (entry as NamedChains).name !== 'string' || !('chains' in entry)) {
        throw new ChainShapeError(`quantities[${i}]`, `quantities[${i}]: expected an object { name: string, chains: array of chains }, got ${JSON.stringify(entry)?.slice(0, 60)}`);
      }
      return entry as NamedChains;
    });
  }
  if (input !== null && typeof input === 'object') {
    return Object.entries(input as Record<string, ChainsInput>).map(([name, chains]) => ({ name, chains }));
  }
  throw new ChainShapeError('quantities', `quantities: expected an object mapping names to chains, or an array of { name, chains }, got ${String(input)}`);
}

/**
 * Summary of several quantities.
 * @param quantities `{ name: chains }` or `[{ name, chains }]`, chains being one array of draws per chain
 * @throws ChainShapeError, NonFiniteDrawError (naming the quantity), TooFewDrawsError, OptionError
 */
export function summarize(quantities: Readonly<Record<string, ChainsInput>> | readonly NamedChains[], options?: SummaryOptions): SummaryTable {
  const levels = checkQuantiles(options);
  const entries = normalise(quantities);
  return summarizeEach(
    entries.map((e) => e.name),
    (j) => entries[j].chains,
    levels,
  );
}

/** The summary loop; chains are fetched one quantity at a time so large traces are never copied whole. */
function summarizeEach(names: readonly string[], chainsOf: (index: number) => unknown, levels: number[]): SummaryTable {
  if (names.length === 0) throw new ChainShapeError('quantities', 'quantities: expected at least one quantity, got none');
  const cache = new WorkspaceCache();
  const rows: QuantitySummary[] = [];
  const truncated = new Map<string, { names: string[]; lengths: number[]; used: number }>();
  let chains = 0;
  let drawsPerChain = 0;
  for (let j = 0; j < names.length; j++) {
    const name = names[j];
    const field = `quantities.${name}`;
    const prepared = prepareChains(chainsOf(j), field);
    requireSplittable(prepared, field);
    if (j === 0) {
      chains = prepared.count;
      drawsPerChain = prepared.draws;
    }
    if (prepared.truncated) {
      // one notice per distinct set of chain lengths, however many quantities share it
      const key = prepared.givenLengths.join(',');
      const entry = truncated.get(key) ?? { names: [], lengths: prepared.givenLengths, used: prepared.draws };
      entry.names.push(name);
      truncated.set(key, entry);
    }
    const ws = cache.get(prepared.count, prepared.draws);
    rows.push(rowOf(name, diagnoseQuantity(ws, prepared.chains, levels), levels));
  }
  const notices = [...truncated.values()].map((t) => truncationNotice(t.names, t.names.length === names.length, t.lengths, t.used));
  return { chains, drawsPerChain, quantileLevels: levels, rows, notices };
}

/** Summary row of one quantity (see summarize). */
export function summarizeQuantity(name: string, chains: ChainsInput, options?: SummaryOptions): QuantitySummary {
  return summarize([{ name, chains }], options).rows[0];
}

export interface DrawsMatrixOptions extends SummaryOptions {
  /** Number of scalar quantities per draw (columns of the row-major draws × dim matrix). */
  dim: number;
  /** Column names; default `x[0]`, `x[1]`, ... */
  names?: readonly string[];
}

/**
 * Summary of a trace stored as one row-major matrix per chain (draws × dim, e.g. the
 * `draws` of a sampling run): column j of every chain is quantity j.
 */
export function summarizeDraws(draws: readonly ArrayLike<number>[], options: DrawsMatrixOptions): SummaryTable {
  const dim = options?.dim;
  if (typeof dim !== 'number' || !Number.isInteger(dim) || dim < 1) throw new OptionError('options.dim', `options.dim: expected a positive integer, got ${String(dim)}`);
  if (!Array.isArray(draws) || draws.length === 0) throw new ChainShapeError('draws', `draws: expected a non-empty array with one draws × dim matrix per chain, got ${String(draws)}`);
  const names = options.names ?? Array.from({ length: dim }, (_, j) => `x[${j}]`);
  if (names.length !== dim) throw new OptionError('options.names', `options.names: expected ${dim} names (one per column), got ${names.length}`);
  draws.forEach((chain, c) => {
    if (chain === null || typeof chain !== 'object' || typeof chain.length !== 'number' || chain.length % dim !== 0) {
      throw new ChainShapeError(`draws[${c}]`, `draws[${c}]: expected a flat row-major matrix whose length is a multiple of dim = ${dim}, got length ${String(chain?.length)}`);
    }
  });
  const levels = checkQuantiles(options);
  // Columns are copied out eight at a time (one 64-byte cache line of a row), into buffers
  // reused from group to group, so the strided reads use every byte they bring in.
  const group = 8;
  let first = -1;
  let buffers: Float64Array[][] = [];
  const column = (j: number): Float64Array[] => {
    const start = j - (j % group);
    if (start !== first) {
      const width = Math.min(group, dim - start);
      buffers = draws.map((chain, c) => {
        const n = chain.length / dim;
        const out = Array.from({ length: width }, (_, w) => (buffers[c]?.[w]?.length === n ? buffers[c][w] : new Float64Array(n)));
        for (let i = 0, k = start; i < n; i++, k += dim) for (let w = 0; w < width; w++) out[w][i] = chain[k + w];
        return out;
      });
      first = start;
    }
    return buffers.map((b) => b[j - start]);
  };
  return summarizeEach(names, column, levels);
}

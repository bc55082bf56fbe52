import { createAutocovarianceWorkspace, type AutocovarianceWorkspace } from './autocovariance.js';
import { nextPowerOfTwo } from './fft.js';
import { normalScoreTable } from './ranks.js';
import { createRadixSortBuffers, type RadixSortBuffers } from './radixArgsort.js';

/**
 * Scratch buffers for diagnosing many quantities that share one shape (M chains of N
 * draws): FFT tables and buffers, autocovariance outputs, the normal-score table of ranks,
 * and pooled work arrays. A summary of 50 quantities allocates these once.
 */
export interface DiagnosticsWorkspace {
  readonly chains: number;
  readonly draws: number;
  /** Draws in each split half, floor(N/2). */
  readonly half: number;
  /** Pooled draws M N. */
  readonly total: number;
  /** FFT tables and buffers with padding n ≥ 2 half (all lags exact), built on first use. */
  fft: AutocovarianceWorkspace | null;
  /** Half that padding, when it still gives ≥ half/8 exact lags (else null). */
  fftShort: AutocovarianceWorkspace | null | undefined;
  /** One autocovariance buffer per split half, for the first series of a pair. */
  readonly acovA: Float64Array[];
  /** One autocovariance buffer per split half, for the second series of a pair. */
  readonly acovB: Float64Array[];
  /** Centred split halves of the first and second series of a pair (direct lag sums). */
  readonly centredA: Float64Array;
  readonly centredB: Float64Array;
  readonly pooled: Float64Array;
  /** Ascending order of the pooled draws (pooled[order[0]] is the smallest) and the sorted draws. */
  readonly order: Uint32Array;
  readonly sorted: Float64Array;
  readonly bulkScores: Float64Array;
  /** Order and sorted values of the folded draws |x - median|. */
  readonly foldedOrder: Uint32Array;
  readonly foldedSorted: Float64Array;
  readonly foldedScores: Float64Array;
  readonly sortBuffers: RadixSortBuffers;
  readonly low: Float64Array;
  readonly high: Float64Array;
  /** Normal scores of the integer ranks 1..M N, built on first use. */
  scoreTable: Float64Array | null;
}

/** Allocates a workspace for `chains` chains of `draws` draws. */
export function createDiagnosticsWorkspace(chains: number, draws: number): DiagnosticsWorkspace {
  const half = Math.floor(draws / 2);
  const total = chains * draws;
  const halves = 2 * chains;
  const acov = (): Float64Array[] => Array.from({ length: halves }, () => new Float64Array(half));
  return {
    chains,
    draws,
    half,
    total,
    fft: null,
    fftShort: undefined,
    acovA: acov(),
    acovB: acov(),
    centredA: new Float64Array(halves * half),
    centredB: new Float64Array(halves * half),
    pooled: new Float64Array(total),
    order: new Uint32Array(total),
    sorted: new Float64Array(total),
    bulkScores: new Float64Array(total),
    foldedOrder: new Uint32Array(total),
    foldedSorted: new Float64Array(total),
    foldedScores: new Float64Array(total),
    sortBuffers: createRadixSortBuffers(total),
    low: new Float64Array(total),
    high: new Float64Array(total),
    scoreTable: null,
  };
}

/** The normal-score table of the workspace, built once. */
export function scoreTableOf(ws: DiagnosticsWorkspace): Float64Array {
  if (ws.scoreTable === null) ws.scoreTable = normalScoreTable(ws.total);
  return ws.scoreTable;
}

/** The full-padding FFT buffers of the workspace, built once. */
export function fftOf(ws: DiagnosticsWorkspace): AutocovarianceWorkspace {
  if (ws.fft === null) ws.fft = createAutocovarianceWorkspace(ws.half);
  return ws.fft;
}

/** The short-padding FFT buffers (exact lags 0..n - half), or null when not worth it. */
export function shortFftOf(ws: DiagnosticsWorkspace): AutocovarianceWorkspace | null {
  if (ws.fftShort === undefined) {
    const full = nextPowerOfTwo(Math.max(2, 2 * ws.half));
    const lags = full / 2 - ws.half;
    ws.fftShort = lags >= Math.max(64, ws.half / 8) ? createAutocovarianceWorkspace(ws.half, lags) : null;
  }
  return ws.fftShort;
}

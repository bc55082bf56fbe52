import { NonFiniteDrawError, RunningStateError } from '../errors.js';
import type { RunningDiagnosticsState } from './runningState.js';

/**
 * Feeds new draws of one chain into the running diagnostics, updating the state in place
 * (and returning it). Cost per draw and quantity: about lagWindow multiply-adds, plus
 * amortised O(1) for the batch ladder and the reservoir; independent of the history length.
 * @param chain chain index, 0 ≤ chain < state.chains
 * @param draws k draws × dim values, row-major (one row per draw)
 * @throws RunningStateError (bad chain index or length), NonFiniteDrawError
 */
export function addDraws(state: RunningDiagnosticsState, chain: number, draws: ArrayLike<number>): RunningDiagnosticsState {
  const { chains, dim } = state;
  if (!Number.isInteger(chain) || chain < 0 || chain >= chains) {
    throw new RunningStateError('chain', `chain: expected an integer from 0 to ${chains - 1}, got ${String(chain)}`);
  }
  if (draws === null || typeof draws !== 'object' || typeof draws.length !== 'number' || draws.length % dim !== 0) {
    throw new RunningStateError('draws', `draws: expected a row-major array whose length is a multiple of dim = ${dim}, got length ${String((draws as { length?: unknown })?.length)}`);
  }
  for (let i = 0; i < draws.length; i++) {
    if (typeof draws[i] !== 'number' || !Number.isFinite(draws[i])) throw new NonFiniteDrawError('draws', chain, Math.floor(i / dim), draws[i]);
  }
  const rows = draws.length / dim;
  for (let r = 0; r < rows; r++) addRow(state, chain, draws, r * dim);
  return state;
}

function addRow(s: RunningDiagnosticsState, c: number, draws: ArrayLike<number>, offset: number): void {
  const { chains, dim, lagWindow: L, batches: B, reservoir: R } = s;
  const n = s.count[c];
  const pos = n % L;
  const maxLag = Math.min(L, n);
  const open = s.openCount[c] + 1;
  const keep = n % s.thinning[c] === 0;
  const at = s.reservoirCount[c];
  for (let q = 0; q < dim; q++) {
    const k = q * chains + c;
    const x = draws[offset + q];
    if (n === 0) s.shift[k] = x;
    const y = x - s.shift[k];
    s.sum[k] += y;
    const lagBase = k * (L + 1);
    const ringBase = k * L;
    const lag = s.lagSums;
    const ring = s.ring;
    lag[lagBase] += y * y;
    // lag l pairs y with y_{n-l}, stored at ring slot (n - l) mod L
    const first = Math.min(maxLag, pos);
    for (let l = 1; l <= first; l++) lag[lagBase + l] += y * ring[ringBase + pos - l];
    for (let l = pos + 1; l <= maxLag; l++) lag[lagBase + l] += y * ring[ringBase + pos - l + L];
    if (n < L) s.head[ringBase + n] = y;
    ring[ringBase + pos] = y;
    const delta = y - s.openMean[k];
    s.openMean[k] += delta / open;
    s.openM2[k] += delta * (y - s.openMean[k]);
    if (keep) s.reservoirDraws[k * R + at] = x;
  }
  s.count[c] = n + 1;
  s.openCount[c] = open;
  if (open === s.batchSize[c]) closeBatch(s, c);
  if (keep) {
    s.reservoirCount[c] = at + 1;
    if (at + 1 === R) thinReservoir(s, c);
  }
}

function closeBatch(s: RunningDiagnosticsState, c: number): void {
  const { chains, dim, batches: B } = s;
  const j = s.closedBatches[c];
  for (let q = 0; q < dim; q++) {
    const k = q * chains + c;
    s.batchMean[k * B + j] = s.openMean[k];
    s.batchM2[k * B + j] = s.openM2[k];
    s.openMean[k] = 0;
    s.openM2[k] = 0;
  }
  s.openCount[c] = 0;
  s.closedBatches[c] = j + 1;
  if (j + 1 < B) return;
  // Ladder full: merge neighbours (Chan, Golub & LeVeque 1979 pairwise update, equal counts b).
  const b = s.batchSize[c];
  for (let q = 0; q < dim; q++) {
    const base = (q * chains + c) * B;
    for (let i = 0; i < B / 2; i++) {
      const ma = s.batchMean[base + 2 * i];
      const mb = s.batchMean[base + 2 * i + 1];
      const d = mb - ma;
      s.batchMean[base + i] = 0.5 * (ma + mb);
      s.batchM2[base + i] = s.batchM2[base + 2 * i] + s.batchM2[base + 2 * i + 1] + d * d * (b / 2);
    }
  }
  s.closedBatches[c] = B / 2;
  s.batchSize[c] = 2 * b;
}

function thinReservoir(s: RunningDiagnosticsState, c: number): void {
  const { chains, dim, reservoir: R } = s;
  for (let q = 0; q < dim; q++) {
    const base = (q * chains + c) * R;
    for (let i = 0; i < R / 2; i++) s.reservoirDraws[base + i] = s.reservoirDraws[base + 2 * i];
  }
  s.reservoirCount[c] = R / 2;
  s.thinning[c] *= 2;
}

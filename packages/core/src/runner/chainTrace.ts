import { createStatsColumns, type StatsColumns } from '../sampler/transitionStats.js';
import { statsPerRow, type RowBlock } from './rowBlock.js';

/** One chain's rows kept in memory, from iteration `offset` on, growing as blocks arrive. */
export interface ChainTrace {
  /** Iteration index of the first row kept. */
  readonly offset: number;
  /** Iteration index just after the last row kept. */
  readonly end: number;
  /** Appends a block; rows before `offset` are skipped. Blocks must arrive in order. */
  append(block: RowBlock): void;
  /** Rows [from, to) (iteration indices) as the sampler's result types (copies). */
  section(from: number, to: number): { draws: Float64Array; stats: StatsColumns; outputs: Float64Array };
  /** Column `j` of the coordinates (or of the outputs) over iterations [from, to). */
  column(kind: 'coordinate' | 'output', j: number, from: number, to: number): Float64Array;
}

/** An empty in-memory trace keeping iterations from `offset` on. */
export function createChainTrace(chain: number, offset: number, dim: number, outputs: number): ChainTrace {
  let capacity = 0;
  let rows = 0;
  let draws = new Float64Array(0);
  let stats = new Float64Array(0);
  let outs = new Float64Array(0);
  const grow = (need: number): void => {
    if (need <= capacity) return;
    const next = Math.max(need, capacity * 2, 256);
    const d = new Float64Array(next * dim);
    d.set(draws);
    const s = new Float64Array(next * statsPerRow);
    s.set(stats);
    const o = new Float64Array(next * outputs);
    o.set(outs);
    draws = d;
    stats = s;
    outs = o;
    capacity = next;
  };
  const check = (from: number, to: number): void => {
    if (!(offset <= from && from <= to && to <= offset + rows)) {
      throw new RangeError(`chain ${chain}: rows [${from}, ${to}) are not all in memory (kept: [${offset}, ${offset + rows}))`);
    }
  };
  return {
    offset,
    get end() {
      return offset + rows;
    },
    append(block) {
      const end = block.first + block.count;
      if (end <= offset) return;
      const skip = Math.max(0, offset - block.first);
      if (block.first + skip !== offset + rows) {
        throw new RangeError(`chain ${chain}: block starting at iteration ${block.first} does not follow iteration ${offset + rows - 1}`);
      }
      const n = block.count - skip;
      grow(rows + n);
      draws.set(block.draws.subarray(skip * dim, block.count * dim), rows * dim);
      stats.set(block.stats.subarray(skip * statsPerRow, block.count * statsPerRow), rows * statsPerRow);
      outs.set(block.outputs.subarray(skip * outputs, block.count * outputs), rows * outputs);
      rows += n;
    },
    section(from, to) {
      check(from, to);
      const a = from - offset;
      const b = to - offset;
      const n = b - a;
      const columns = createStatsColumns(n);
      for (let r = 0; r < n; r++) {
        const k = (a + r) * statsPerRow;
        columns.stepSize[r] = stats[k];
        columns.treeDepth[r] = stats[k + 1];
        columns.leapfrogSteps[r] = stats[k + 2];
        columns.divergent[r] = stats[k + 3];
        columns.energy[r] = stats[k + 4];
        columns.acceptance[r] = stats[k + 5];
        columns.logDensity[r] = stats[k + 6];
      }
      return { draws: draws.slice(a * dim, b * dim), stats: columns, outputs: outs.slice(a * outputs, b * outputs) };
    },
    column(kind, j, from, to) {
      check(from, to);
      const width = kind === 'coordinate' ? dim : outputs;
      const source = kind === 'coordinate' ? draws : outs;
      const out = new Float64Array(to - from);
      for (let r = 0, k = (from - offset) * width + j; r < out.length; r++, k += width) out[r] = source[k];
      return out;
    },
  };
}

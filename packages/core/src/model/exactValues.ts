import type { ResolvedParameter } from './declarations.js';
import type { ExactValues } from './spec.js';

/**
 * A named view of a constrained vector θ: vector parameters are `Float64Array`
 * views into θ (made once), scalars are numbers copied in by `refresh()`. No
 * allocation per call.
 */
export function exactValueView(params: readonly ResolvedParameter[], theta: Float64Array): {
  values: ExactValues;
  refresh(): void;
} {
  const values: Record<string, number | Float64Array> = {};
  const scalars: ResolvedParameter[] = [];
  for (const p of params) {
    if (p.scalar) {
      values[p.name] = 0;
      scalars.push(p);
    } else {
      values[p.name] = theta.subarray(p.at, p.at + p.size);
    }
  }
  return {
    values,
    refresh() {
      for (const p of scalars) values[p.name] = theta[p.at];
    },
  };
}

/** Copies a named view into fresh arrays, for handing to callers. */
export function copyValues(params: readonly ResolvedParameter[], theta: Float64Array): Record<string, number | Float64Array> {
  const out: Record<string, number | Float64Array> = {};
  for (const p of params) out[p.name] = p.scalar ? theta[p.at] : theta.slice(p.at, p.at + p.size);
  return out;
}

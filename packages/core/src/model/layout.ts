import { ModelDeclarationError } from './errors.js';

/** Where one parameter's constrained values sit in the flat constrained vector. */
export interface ParameterSlot {
  readonly name: string;
  /** First index in the constrained vector. */
  readonly offset: number;
  /** Number of elements (1 for a scalar). */
  readonly size: number;
  readonly scalar: boolean;
}

/**
 * Layout of the flat constrained vector θ that fused float64 likelihoods read and
 * whose gradient they write: parameters in declaration order, vectors contiguous.
 */
export interface ParameterLayout {
  /** Total number of constrained values. */
  readonly length: number;
  /** Element names, `name` or `name[i]` (0-based). */
  readonly names: readonly string[];
  readonly slots: readonly ParameterSlot[];
  /** First index of parameter `name`; throws ModelDeclarationError for unknown names. */
  offset(name: string): number;
  /** Number of elements of parameter `name`. */
  size(name: string): number;
}

/** Builds the layout from (name, size, scalar) in declaration order. */
export function buildLayout(entries: readonly { name: string; size: number; scalar: boolean }[]): ParameterLayout {
  const slots: ParameterSlot[] = [];
  const names: string[] = [];
  const byName = new Map<string, ParameterSlot>();
  let offset = 0;
  for (const e of entries) {
    const slot: ParameterSlot = { name: e.name, offset, size: e.size, scalar: e.scalar };
    slots.push(slot);
    byName.set(e.name, slot);
    for (let i = 0; i < e.size; i++) names.push(e.scalar ? e.name : `${e.name}[${i}]`);
    offset += e.size;
  }
  const find = (name: string): ParameterSlot => {
    const s = byName.get(name);
    if (!s) {
      throw new ModelDeclarationError('parameter name', name, `one of the declared parameters: ${[...byName.keys()].join(', ')}`);
    }
    return s;
  };
  return {
    length: offset,
    names,
    slots,
    offset: (name) => find(name).offset,
    size: (name) => find(name).size,
  };
}

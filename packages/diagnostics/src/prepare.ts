import { prepareChains, requireSplittable, type PreparedChains } from './validateChains.js';
import { createDiagnosticsWorkspace, type DiagnosticsWorkspace } from './workspace.js';
import { loadQuantity, type LoadedQuantity } from './quantitySteps.js';

/** Validated chains, a workspace for their shape, and the quantity loaded into it. */
export interface PreparedQuantity {
  readonly prepared: PreparedChains;
  readonly ws: DiagnosticsWorkspace;
  readonly loaded: LoadedQuantity;
}

/** Validates (zod), refuses too-short chains, and pools and sorts the draws once. */
export function prepareQuantity(chains: unknown, field = 'chains'): PreparedQuantity {
  const prepared = prepareChains(chains, field);
  requireSplittable(prepared, field);
  const ws = createDiagnosticsWorkspace(prepared.count, prepared.draws);
  return { prepared, ws, loaded: loadQuantity(ws, prepared.chains) };
}

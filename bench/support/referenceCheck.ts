/**
 * Checks that the reference likelihood (referenceLikelihood.ts) computes the same
 * log-likelihood and gradient as the shipped model's own likelihood (whose gradient its
 * owners test against central differences), at positions spread around the starting
 * point. Two independent implementations agreeing to ~1e-10 is the check. Not timed.
 *
 * Run: npx tsx --conditions=source bench/support/referenceCheck.ts
 */
import { pathToFileURL } from 'node:url';
import { createRandomStream } from '@apsis/core';
import type { PlanetSystemModel } from '@apsis/models';
import { jointScenario, rvScenario, transitScenario } from './modelScenarios.js';
import { createReferenceLikelihood } from './referenceLikelihood.js';

export interface ReferenceAgreement {
  readonly model: string;
  /** Largest |Δ log L| / max(1, |log L|) over the positions. */
  readonly value: number;
  /** Largest |Δ ∂/∂Φ_j| / (|∂/∂Φ_j| + scale_j) over positions and slots. */
  readonly gradient: number;
  readonly positions: number;
}

/** Compares the reference with the model's likelihood at `count` positions. */
export function compareWithModel(name: string, model: PlanetSystemModel, count = 6): ReferenceAgreement {
  const reference = createReferenceLikelihood(model);
  const shipped = model.structure.likelihood;
  const rng = createRandomStream(`reference check ${name}`);
  const L = model.structure.plan.layout.length;
  const g1 = new Float64Array(L);
  const g2 = new Float64Array(L);
  let value = 0;
  let gradient = 0;
  let used = 0;
  for (let k = 0; k < count * 4 && used < count; k++) {
    const u = Float64Array.from({ length: model.dim }, () => 0.7 * rng.normal());
    const phi = model.physicalAt(u);
    const a = reference.evaluate(phi, g1);
    const b = shipped.evaluate(phi, g2);
    if (!Number.isFinite(b)) continue;
    used++;
    value = Math.max(value, Math.abs(a - b) / Math.max(1, Math.abs(b)));
    for (let j = 0; j < L; j++) {
      if (g1[j] === 0 && g2[j] === 0) continue;
      // Scale of a gradient entry: its size across slots (a relative test per slot
      // would fail on entries that are nearly zero by cancellation).
      const scale = 1e-6 * Math.max(...Array.from(g2, Math.abs));
      gradient = Math.max(gradient, Math.abs(g1[j] - g2[j]) / (Math.abs(g2[j]) + scale));
    }
  }
  return { model: name, value, gradient, positions: used };
}

async function main(): Promise<void> {
  const cases: [string, PlanetSystemModel][] = [
    ['joint (N = 2000)', await jointScenario({ lightCurvePoints: 2000 })],
    ['2-planet RV (N = 200)', await rvScenario({ points: 200 })],
    ['2-planet transit (N = 2000)', await transitScenario({ lightCurvePoints: 2000 })],
  ];
  for (const [name, model] of cases) {
    const r = compareWithModel(name, model);
    console.log(`${r.model}: ${r.positions} positions; value ${r.value.toExponential(1)}, gradient ${r.gradient.toExponential(1)} (relative differences from the model's own likelihood)`);
  }
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) await main();

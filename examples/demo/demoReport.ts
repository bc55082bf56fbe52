/**
 * The demo's report input for `@apsis/report`: trace and rank plots of the sampled
 * parameters and the key derived quantities, a pair plot of the transit shape
 * parameters (where the posterior is most correlated), the run's settings, and the
 * phase-folded fit panels passed in.
 */
import type { RunResult } from '@apsis/core';
import type { FitPanel, PlotLimits, ReportInput } from '@apsis/report';
import type { PlanetSystemModel } from '@apsis/models';

/** Derived quantities shown in the report beside the sampled parameters. */
const reportedDerived = [
  'eccentricity_b',
  'eccentricity_c',
  'omega_c',
  'inclination_b',
  'scaledSemiMajorAxis_b',
  'totalDuration_b',
  'planetMass_b',
  'planetRadius_b',
  'minimumMass_c',
] as const;

/** Quantities of the pair plot: the transit shape and the RV amplitude of b. */
export const pairQuantities = ['impactParameter_b', 'radiusRatio_b', 'starDensity', 'scaledSemiMajorAxis_b', 'semiAmplitude_b'] as const;

/** Column names shown in the report, in order: sampled parameters (physical values), then derived quantities. */
export function reportColumns(model: PlanetSystemModel): string[] {
  const sampled = model.parameters.flatMap((p) => p.names);
  const all = new Set(model.outputs.names);
  return [...sampled, ...reportedDerived.filter((n) => all.has(n) && !sampled.includes(n))];
}

export interface DemoReportSettings {
  readonly title: string;
  readonly seed: number;
  readonly warmup: number;
  readonly draws: number;
  readonly metric: string;
  readonly maxTreeDepth: number;
  readonly targetAcceptance: number;
  readonly backend: string;
  readonly elapsedSeconds: number;
  readonly notes: readonly string[];
}

/** The report input of a finished demo run. */
export function demoReportInput(
  model: PlanetSystemModel,
  result: RunResult,
  settings: DemoReportSettings,
  fits: readonly FitPanel[],
  limits: PlotLimits = {},
): ReportInput {
  const outputs = result.outputs;
  if (!outputs) throw new Error('demo report: the run has no recorded outputs (constrained values)');
  const names = reportColumns(model);
  const at = names.map((n) => outputs.names.indexOf(n));
  const width = outputs.names.length;
  const chains = outputs.values.map((values) => {
    const rows = values.length / width;
    const out = new Float64Array(rows * names.length);
    for (let i = 0; i < rows; i++) for (let j = 0; j < names.length; j++) out[i * names.length + j] = values[i * width + at[j]];
    return out;
  });
  const units: Record<string, string> = {};
  for (const n of names) if (model.units[n]) units[n] = model.units[n];
  return {
    title: settings.title,
    subtitle: 'Invented system, simulated data: a demonstration of apsis',
    createdAt: new Date(),
    run: {
      seed: settings.seed,
      chains: result.draws.length,
      warmup: settings.warmup,
      draws: settings.draws,
      method: 'NUTS',
      metric: settings.metric,
      backend: settings.backend,
      elapsedSeconds: settings.elapsedSeconds,
      maxTreeDepth: settings.maxTreeDepth,
      targetAcceptance: settings.targetAcceptance,
      notes: [...settings.notes],
    },
    quantities: { names, units, chains },
    stats: result.stats.map((s) => ({
      divergent: s.divergent,
      treeDepth: s.treeDepth,
      energy: s.energy,
      stepSize: s.stepSize,
      acceptance: s.acceptance,
      leapfrogSteps: s.leapfrogSteps,
    })),
    pairs: pairQuantities.filter((n) => names.includes(n)),
    fits: [...fits],
    limits,
  };
}

/**
 * The demo's joint radial-velocity and transit model, built from the simulated
 * observations and the user's starting guesses (never from the true values).
 * `buildDemoModel` is also the factory that worker threads call to rebuild the model
 * on their side (a target recipe: module, export name, JSON arguments).
 */
import { createJointModel, type JointModelInput, type PlanetSystemModel } from '@apsis/models';
import { densityFromMassRadius, guesses, photometer, star } from './scenario.js';
import { simulateObservations, type DemoObservations } from './simulateObservations.js';

/** The builder input of the demo's fit. */
export function demoModelInput(observations: DemoObservations): JointModelInput {
  return {
    rv: observations.rv,
    lightCurves: [{ ...observations.lightCurve, band: photometer.label }],
    planets: [
      { label: 'b', period: guesses.b.period, tc: guesses.b.tc },
      { label: 'c', period: guesses.c.period, tc: guesses.c.tc, transiting: false },
    ],
    star: {
      mass: star.mass,
      massUncertainty: star.massUncertainty,
      radius: star.radius,
      radiusUncertainty: star.radiusUncertainty,
      ...stellarDensityPrior(),
    },
  };
}

/**
 * A normal prior on the mean stellar density from the stated mass and radius:
 * ρ ∝ M/R³, so σ_ρ/ρ = √((σ_M/M)² + (3 σ_R/R)²) to first order. The transit alone
 * measures ρ only weakly through 30-minute exposures; this prior is what a user with
 * a characterised star would add.
 */
export function stellarDensityPrior(): { density: number; densityUncertainty: number } {
  const density = densityFromMassRadius(star.mass, star.radius);
  const relative = Math.hypot(star.massUncertainty / star.mass, (3 * star.radiusUncertainty) / star.radius);
  return { density, densityUncertainty: density * relative };
}

/** Arguments of {@link buildDemoModel} (JSON, so that a worker thread can receive them). */
export interface DemoModelArgs {
  /** Seed text of the simulated observations (default: the scenario's). */
  readonly dataSeed?: string;
}

/** Simulates the observations and builds the joint model: the demo's target recipe factory. */
export async function buildDemoModel(args: DemoModelArgs | null = null): Promise<PlanetSystemModel> {
  const observations = simulateObservations(args?.dataSeed);
  return createJointModel(demoModelInput(observations));
}

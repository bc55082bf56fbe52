/**
 * The three ready model builders. Each validates its input (errors name the row and
 * field), derives default priors from the data, and returns a compiled
 * {@link PlanetSystemModel} for `runChains`.
 */
import { FitSettingsError } from './errors.js';
import type { JointModelInput, RvModelInput, TransitModelInput } from './inputs.js';
import { buildPlanetModel, type PlanetSystemModel } from './planetModel.js';
import { prepareInput } from './prepareInput.js';

/**
 * A radial-velocity model: Keplerian planets, an offset and a jitter per instrument,
 * an optional linear or quadratic trend about the reference epoch.
 *
 * ```ts
 * const model = await createRvModel({
 *   rv: { times, values, errors, instrument },     // days, m/s, m/s, labels
 *   planets: [{ label: 'b', period: 4.23 }],
 *   star: { mass: 0.95, massUncertainty: 0.04 },   // for masses and semi-major axes
 * });
 * const run = await runChains(model, { chains: 4, seed: 1 });
 * ```
 */
export async function createRvModel(input: RvModelInput): Promise<PlanetSystemModel> {
  return buildPlanetModel(prepareInput('rv', input));
}

/**
 * A transit model: planets on Keplerian orbits (circular unless `eccentric: true`),
 * one or more light curves each with a baseline, a jitter and optional dilution,
 * exposure-time integration, quadratic limb darkening per band.
 */
export async function createTransitModel(input: TransitModelInput): Promise<PlanetSystemModel> {
  return buildPlanetModel(prepareInput('transit', input));
}

/**
 * A joint radial-velocity and transit model: each planet's period, conjunction time,
 * eccentricity and argument of periastron are shared by both kinds of data. Planets
 * marked `transiting: false` are seen in the radial velocities only.
 */
export async function createJointModel(input: JointModelInput): Promise<PlanetSystemModel> {
  const system = prepareInput('joint', input);
  if (!system.planets.some((p) => p.transiting)) {
    throw new FitSettingsError('planets', input.planets.map((p) => p.label).join(', '), 'at least one transiting planet in a joint fit (or use createRvModel)');
  }
  return buildPlanetModel(system);
}

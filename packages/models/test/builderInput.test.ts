import { priors } from '@apsis/core';
import { describe, expect, it } from 'vitest';
import { createJointModel, createRvModel, createTransitModel, FitDataError, FitSettingsError } from '../src/index.js';
import { ORIGIN, lightCurve, rvData, transitWindows, twoPlanets } from './builderFixtures.js';

/**
 * Bad input is rejected before anything is built, and every message names the field
 * and, for data, the row (common practice for this project: errors name the field, the
 * value and what was expected).
 */
const rv = rvData(30, 'input-rv');
const planets = [{ label: 'b', period: 4.2317 }];

function mutated(base: object, field: string, row: number, value: unknown): Record<string, unknown> {
  const column = Array.from((base as Record<string, ArrayLike<unknown>>)[field]);
  column[row] = value;
  return { ...base, [field]: column };
}

async function failure(p: Promise<unknown>): Promise<Error> {
  try {
    await p;
  } catch (e) {
    return e as Error;
  }
  throw new Error('expected a rejection');
}

describe('radial-velocity input', () => {
  it('names the row and field of a bad value, error or instrument label', async () => {
    const cases: [Record<string, unknown>, RegExp][] = [
      [mutated(rv, 'times', 3, Number.NaN), /^rv\.times\[3\] = NaN: expected a finite number \(days\)/],
      [mutated(rv, 'values', 7, Infinity), /^rv\.values\[7\] = Infinity: expected a finite number \(m\/s\)/],
      [mutated(rv, 'errors', 17, 0), /^rv\.errors\[17\] = 0: expected a finite positive number \(m\/s\)/],
      [mutated(rv, 'errors', 2, -1), /^rv\.errors\[2\] = -1/],
      [{ ...mutated(rv, 'instrument', 5, 'east'), instruments: ['north', 'south'] }, /^rv\.instrument\[5\] = "east": expected one of the instruments north, south/],
      [mutated(rv, 'instrument', 4, 'two words'), /^rv\.instrument\[4\] = "two words": expected a label of letters, digits and underscores/],
    ];
    for (const [data, pattern] of cases) {
      const e = await failure(createRvModel({ rv: data as never, planets }));
      expect(e).toBeInstanceOf(FitDataError);
      expect(e.message).toMatch(pattern);
    }
  });

  it('names mismatched lengths, instruments without points and too few points', async () => {
    let e = await failure(createRvModel({ rv: { ...rv, values: (rv.values as number[]).slice(0, 10) }, planets }));
    expect(e.message).toMatch(/^rv\.values\.length = 10: expected 30, the length of rv\.times/);
    e = await failure(createRvModel({ rv: { ...rv, instruments: ['north', 'south', 'west'] }, planets }));
    expect(e.message).toMatch(/^rv\.instruments\[2\] = "west": expected an instrument with at least one point/);
    const few = { times: [1, 2, 3], values: [1, 2, 3], errors: [1, 1, 1], instrument: 'north' };
    e = await failure(createRvModel({ rv: few, planets }));
    expect(e).toBeInstanceOf(FitDataError);
    expect(e.message).toMatch(/^data = 3: expected at least 7 points in all, one per sampled parameter/);
  });
});

describe('light-curve input', () => {
  const [b] = twoPlanets;
  const lc = lightCurve('cam', [b], transitWindows(b, 20, 10 / 1440, 0.15), 'input-lc');
  const tplanets = [{ label: 'b', period: b.period, tc: b.tc }];

  it('names the light curve, row and field', async () => {
    const bad = { ...lc, flux: Array.from(lc.flux as Float64Array) };
    bad.flux[3] = Number.NaN;
    let e = await failure(createTransitModel({ lightCurves: [lc, bad], planets: tplanets }));
    expect(e).toBeInstanceOf(FitDataError);
    expect(e.message).toMatch(/^lightCurves\[1\]\.flux\[3\] = NaN: expected a finite number/);
    const exposures = (lc.times as Float64Array).map(() => 10 / 1440);
    exposures[8] = 0;
    e = await failure(createTransitModel({ lightCurves: [{ ...lc, exposureTime: exposures }], planets: tplanets }));
    expect(e.message).toMatch(/^lightCurves\[0\]\.exposureTime\[8\] = 0: expected a finite positive number \(days\)/);
    e = await failure(createTransitModel({ lightCurves: [{ ...lc, errors: (lc.errors as Float64Array).map((x, i) => (i === 11 ? 0 : x)) }], planets: tplanets }));
    expect(e.message).toMatch(/^lightCurves\[0\]\.errors\[11\] = 0/);
    e = await failure(createTransitModel({ lightCurves: [{ ...lc, exposureTime: -1 }], planets: tplanets }));
    expect(e).toBeInstanceOf(FitSettingsError);
    expect(e.message).toMatch(/^lightCurves\[0\]\.exposureTime = -1: expected a finite number >= 0 \(days\)/);
  });

  it('needs a mid-transit time for a transiting planet and unique labels', async () => {
    let e = await failure(createTransitModel({ lightCurves: [lc], planets: [{ label: 'b', period: 3 }] }));
    expect(e.message).toMatch(/^planets\[0\]\.tc = undefined: expected a mid-transit time/);
    e = await failure(createTransitModel({ lightCurves: [lc, lc], planets: tplanets }));
    expect(e.message).toMatch(/^lightCurves\[1\]\.label = "cam": expected a label not used by another light curve/);
    e = await failure(createJointModel({ rv, lightCurves: [lc], planets: [{ label: 'b', period: 3, transiting: false }] }));
    expect(e.message).toMatch(/^planets = "b": expected at least one transiting planet/);
  });
});

describe('settings', () => {
  it('rejects unknown parameter names in priors, fixed and start, listing the known ones', async () => {
    let e = await failure(createRvModel({ rv, planets, priors: { period_x: priors.normal(4, 1) } }));
    expect(e).toBeInstanceOf(FitSettingsError);
    expect(e.message).toMatch(/^priors\.period_x = .*expected a parameter of this model: period_b, tc_b, eccentricity_b, semiAmplitude_b/);
    e = await failure(createRvModel({ rv, planets, fixed: { jitter_west: 1 } }));
    expect(e.message).toMatch(/^fixed\.jitter_west = 1: expected a parameter of this model: .*jitter_north/);
    e = await failure(createRvModel({ rv, planets, start: { offset_east: 1 } }));
    expect(e.message).toMatch(/^start\.offset_east = 1/);
  });

  it('rejects malformed priors, a fixed value with a prior, half an eccentricity vector, and unknown options', async () => {
    let e = await failure(createRvModel({ rv, planets, priors: { period_b: { gaussian: [4, 1] } } as never }));
    expect(e.message).toMatch(/^priors\.period_b\.gaussian = "gaussian": expected a prior from `priors` or \{ name: \[arguments\] \}/);
    e = await failure(createRvModel({ rv, planets, priors: { period_b: { normal: [4, -1] } } }));
    expect(e.message).toMatch(/^priors\.period_b\.normal = .*normal\.sd = -1/);
    e = await failure(createRvModel({ rv, planets, priors: { jitter_north: { halfNormal: [2] } }, fixed: { jitter_north: 1 } }));
    expect(e.message).toMatch(/^fixed\.jitter_north = 1: expected either a fixed value or a prior/);
    e = await failure(createRvModel({ rv, planets, fixed: { sqrtEcosW_b: 0.1 } }));
    expect(e.message).toMatch(/^fixed\.sqrtEsinW_b = undefined: expected a value: sqrtEcosW_b and sqrtEsinW_b are fixed together/);
    e = await failure(createRvModel({ rv, planets, fixed: { semiAmplitude_b: -3 } }));
    expect(e.message).toMatch(/^fixed\.semiAmplitude_b = -3: expected a value in \(0, Infinity\]/);
    e = await failure(createRvModel({ rv, planets, trend: 'cubic' } as never));
    expect(e.message).toMatch(/^trend = "cubic": expected 'none', 'linear' or 'quadratic'/);
    e = await failure(createRvModel({ rv, planets, lightCurves: [] } as never));
    expect(e.message).toMatch(/^lightCurves = .*no such field; known fields: planets, star/);
    e = await failure(createRvModel({ rv, planets: [{ label: 'b', period: -4 }] }));
    expect(e.message).toMatch(/^planets\[0\]\.period = -4: expected a finite positive number \(days\)/);
    e = await failure(createRvModel({ rv, planets, priors: { eccentricity_b: priors.uniform(0.1, 0.5) } }));
    expect(e.message).toMatch(/^priors\.eccentricity_b = "uniform\(0\.1, 0\.5\)": expected a prior on the eccentricity whose support starts at 0/);
    e = await failure(createTransitModel({ lightCurves: [lightCurve('cam', [twoPlanets[0]], transitWindows(twoPlanets[0], 10, 0.01, 0.1), 'x')], planets: [{ label: 'b', period: 4.2317, tc: ORIGIN + 1.37 }], priors: { impactParameter_b: priors.uniform(0, 1) } }));
    expect(e.message).toMatch(/^priors\.impactParameter_b = .*sampled as b\/\(1 \+ k\), uniform/);
  });
});

/**
 * Per-planet float64 loops of the radial-velocity kernels: the curve and its fused
 * vector-Jacobian product. Internal to `orbit/`; the public faces are `rvCurve.ts` and
 * `rvLikelihood.ts`.
 *
 * Model (Winn 2010, "Transits and Occultations", eqs. 2-4 convention): the star's
 * velocity is v = K [cos(f + omega) + e cos omega], with M(t) = n (t - tc) + M_c,
 * n = 2 pi / P and M_c the mean anomaly at inferior conjunction (f_c = pi/2 - omega).
 *
 * No trigonometric call per point beyond the Kepler solve: with D = 1 - e cos E,
 *   cos f = (cos E - e) / D,  sin f = sqrt(1 - e^2) sin E / D.
 * Partial derivatives, per point (dv/df = -K sin(f + omega)):
 *   dv/dK  = cos(f + omega) + e cos omega
 *   dv/dM  = dv/df * df/dM,  df/dM = sqrt(1 - e^2) / D^2   (dE/dM = 1/D, df/dE = sqrt(1-e^2)/D)
 *   dv/dtc = -n dv/dM,  dv/dP = -(n/P) (t - tc) dv/dM
 *   dv/de  = K cos omega + dv/df * df/de|_M + dv/dM * dM_c/de,
 *            df/de|_M = sin f (2 + e cos f) / (1 - e^2)
 *   dv/domega = dv/df * (1 + df/dM * dM_c/domega) - K e sin omega
 *             = e [dv/df (sin omega - cos f)(2 + e sin omega + e cos f) / (1 + e sin omega)^2
 *                  - K sin omega],
 * the last form carrying the factor e explicitly so that (dv/domega)/e is finite at e = 0
 * (needed by the root form (sqrt(e) cos omega, sqrt(e) sin omega)).
 */
import { conjunctionMeanAnomalyPartialsInto } from './anomalies.js';
import { markleyConstant, solveKeplerInPlace } from './kepler.js';
import {
  D_CW,
  D_E,
  D_H,
  D_K,
  D_KK,
  D_MC,
  D_N,
  D_P,
  D_ROOT,
  D_SW,
  D_TC,
  D_W,
  type EccentricityForm,
} from './planetParameters.js';

const scratch = new Float64Array(3);
const partials = new Float64Array(2);

/**
 * Adds planet `o`'s velocity (m/s) at each of `times` (days) into `out`; when `sinF`
 * is given, also stores sin f and cos f at `sinF[cacheAt + i]`, `cosF[cacheAt + i]`.
 */
export function addPlanetCurve(
  times: Float64Array,
  dec: Float64Array,
  o: number,
  out: Float64Array,
  sinF: Float64Array | null,
  cosF: Float64Array | null,
  cacheAt: number,
): void {
  const tc = dec[o + D_TC];
  const e = dec[o + D_E];
  const K = dec[o + D_K];
  const n = dec[o + D_N];
  const Mc = dec[o + D_MC];
  const sw = dec[o + D_SW];
  const cw = dec[o + D_CW];
  const root = dec[o + D_ROOT];
  const oneMinusE = 1 - e;
  const mb = markleyConstant(e);
  const ecw = e * cw;
  const s = scratch;
  const N = times.length;
  for (let i = 0; i < N; i++) {
    const dt = times[i] - tc;
    s[0] = n * dt + Mc;
    solveKeplerInPlace(e, oneMinusE, mb, s, 0);
    const sinE = s[1];
    const cosE = s[2];
    let D: number;
    let cosEminusE: number;
    if (cosE > 0) {
      // 1 - cos E = sin^2 E / (1 + cos E): no cancellation near periastron when e -> 1.
      const q = (sinE * sinE) / (1 + cosE);
      D = oneMinusE + e * q;
      cosEminusE = oneMinusE - q;
    } else {
      D = 1 - e * cosE;
      cosEminusE = cosE - e;
    }
    const invD = 1 / D;
    const cf = cosEminusE * invD;
    const sf = root * sinE * invD;
    out[i] += K * (cf * cw - sf * sw + ecw);
    if (sinF !== null && cosF !== null) {
      sinF[cacheAt + i] = sf;
      cosF[cacheAt + i] = cf;
    }
  }
}

/**
 * Turns the five per-planet sums into the gradient slots of planet `o` (layout of
 * `planetParameters.ts`), in the requested eccentricity form. Writes (overwrites)
 * grad[gradAt .. gradAt + 4].
 */
function finishPlanetGradient(
  dec: Float64Array,
  o: number,
  form: EccentricityForm,
  sumK: number,
  sumM: number,
  sumMdt: number,
  sumE: number,
  sumWoverE: number,
  sumWeights: number,
  grad: Float64Array,
  gradAt: number,
): void {
  const P = dec[o + D_P];
  const n = dec[o + D_N];
  const e = dec[o + D_E];
  const sw = dec[o + D_SW];
  conjunctionMeanAnomalyPartialsInto(e, dec[o + D_W], partials, 0);
  const g = 1 + e * sw;
  const dWoverE = sumWoverE / (g * g) - dec[o + D_K] * sw * sumWeights;
  const dE = sumE + sumM * partials[0];
  grad[gradAt] = (-n / P) * sumMdt;
  grad[gradAt + 1] = -n * sumM;
  if (form === 'polar') {
    grad[gradAt + 2] = dE;
    grad[gradAt + 3] = e * dWoverE;
  } else {
    const h = dec[o + D_H];
    const k = dec[o + D_KK];
    grad[gradAt + 2] = 2 * h * dE - k * dWoverE;
    grad[gradAt + 3] = 2 * k * dE + h * dWoverE;
  }
  grad[gradAt + 4] = sumK;
}

/**
 * Vector-Jacobian product of planet `o`'s curve from cached sin f, cos f (written by
 * {@link addPlanetCurve} with the same parameters): grad[gradAt..+4] =
 * sum_i weights[i] dv_i/d(params). No Kepler solve.
 */
export function planetVjpFromCache(
  times: Float64Array,
  dec: Float64Array,
  o: number,
  form: EccentricityForm,
  weights: Float64Array,
  sinF: Float64Array,
  cosF: Float64Array,
  cacheAt: number,
  grad: Float64Array,
  gradAt: number,
): void {
  const tc = dec[o + D_TC];
  const e = dec[o + D_E];
  const K = dec[o + D_K];
  const sw = dec[o + D_SW];
  const cw = dec[o + D_CW];
  const root = dec[o + D_ROOT];
  const inv1mE2 = 1 / (root * root);
  const ecw = e * cw;
  const Kcw = K * cw;
  let sumK = 0;
  let sumM = 0;
  let sumMdt = 0;
  let sumE = 0;
  let sumWoverE = 0;
  let sumWeights = 0;
  const N = times.length;
  for (let i = 0; i < N; i++) {
    const w = weights[i];
    const sf = sinF[cacheAt + i];
    const cf = cosF[cacheAt + i];
    const onePlusEcf = 1 + e * cf;
    // 1/D = (1 + e cos f)/(1 - e^2);  df/dM = sqrt(1-e^2)/D^2 = (1 + e cos f)^2 / (1-e^2)^(3/2)
    const invD = onePlusEcf * inv1mE2;
    const dvdf = -K * (sf * cw + cf * sw);
    const gdvdf = w * dvdf;
    const gM = gdvdf * root * invD * invD;
    sumWeights += w;
    sumK += w * (cf * cw - sf * sw + ecw);
    sumM += gM;
    sumMdt += gM * (times[i] - tc);
    sumE += w * Kcw + gdvdf * sf * (2 + e * cf) * inv1mE2;
    sumWoverE += gdvdf * (sw - cf) * (2 + e * (sw + cf));
  }
  finishPlanetGradient(dec, o, form, sumK, sumM, sumMdt, sumE, sumWoverE, sumWeights, grad, gradAt);
}

/**
 * Fused vector-Jacobian product of planet `o`'s curve: Kepler solve and accumulation
 * in one loop, no per-point storage. grad[gradAt..+4] = sum_i weights[i] dv_i/d(params);
 * when `out` is given, planet `o`'s velocities are also added into it.
 */
export function planetVjpFused(
  times: Float64Array,
  dec: Float64Array,
  o: number,
  form: EccentricityForm,
  weights: Float64Array,
  grad: Float64Array,
  gradAt: number,
  out: Float64Array | null,
): void {
  const tc = dec[o + D_TC];
  const e = dec[o + D_E];
  const K = dec[o + D_K];
  const n = dec[o + D_N];
  const Mc = dec[o + D_MC];
  const sw = dec[o + D_SW];
  const cw = dec[o + D_CW];
  const root = dec[o + D_ROOT];
  const oneMinusE = 1 - e;
  const mb = markleyConstant(e);
  const inv1mE2 = 1 / (root * root);
  const ecw = e * cw;
  const Kcw = K * cw;
  const s = scratch;
  let sumK = 0;
  let sumM = 0;
  let sumMdt = 0;
  let sumE = 0;
  let sumWoverE = 0;
  let sumWeights = 0;
  const N = times.length;
  for (let i = 0; i < N; i++) {
    const dt = times[i] - tc;
    s[0] = n * dt + Mc;
    solveKeplerInPlace(e, oneMinusE, mb, s, 0);
    const sinE = s[1];
    const cosE = s[2];
    let D: number;
    let cosEminusE: number;
    if (cosE > 0) {
      const q = (sinE * sinE) / (1 + cosE);
      D = oneMinusE + e * q;
      cosEminusE = oneMinusE - q;
    } else {
      D = 1 - e * cosE;
      cosEminusE = cosE - e;
    }
    const invD = 1 / D;
    const cf = cosEminusE * invD;
    const sf = root * sinE * invD;
    const w = weights[i];
    const c = cf * cw - sf * sw + ecw;
    if (out !== null) out[i] += K * c;
    const dvdf = -K * (sf * cw + cf * sw);
    const gdvdf = w * dvdf;
    const gM = gdvdf * root * invD * invD;
    sumWeights += w;
    sumK += w * c;
    sumM += gM;
    sumMdt += gM * dt;
    sumE += w * Kcw + gdvdf * sf * (2 + e * cf) * inv1mE2;
    sumWoverE += gdvdf * (sw - cf) * (2 + e * (sw + cf));
  }
  finishPlanetGradient(dec, o, form, sumK, sumM, sumMdt, sumE, sumWoverE, sumWeights, grad, gradAt);
}

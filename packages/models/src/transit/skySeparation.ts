/**
 * Sky-projected star-planet separation z(t) in stellar radii for a Keplerian orbit, its
 * partial derivatives in (P, tc, e, omega, a/R_*, b or i), and whether the planet is in
 * front of the star (Z > 0). Conventions of Winn (2010, eqs. 2-4), see
 * `transitParameters.ts`.
 *
 * With E the eccentric anomaly (from M = 2 pi (t - tc)/P + M_c), the orbit-plane
 * position in stellar radii is x = (a/R_*)(cos E - e), y = (a/R_*)√(1 - e²) sin E, so
 * r cos(omega + f) = C = x cos omega - y sin omega and r sin(omega + f) = S =
 * x sin omega + y cos omega; then X = -C, Y = -S cos i, Z = S sin i and
 * z² = C² + S² cos² i. Derivatives use ∂E/∂M = 1/(1 - e cos E),
 * ∂E/∂e|_M = sin E/(1 - e cos E) (implicit function theorem on Kepler's equation),
 * plus the dependence of M_c and cos i on e and omega.
 *
 * Near conjunction (|M - M_c| small, which is every point a transit can touch) Kepler's
 * equation is solved here for δ = E - E_c by Newton's method with sin δ and cos δ from
 * their Taylor series and sin E, cos E by angle addition, so no trigonometric call is
 * made; elsewhere the general solver of `orbit/kepler.ts` is used. Both agree to
 * rounding level (tested).
 */
import { solveKeplerInto } from '../orbit/kepler.js';
import {
  TD_CI_DA,
  TD_CI_DANGLE,
  TD_CI_DE,
  TD_CI_DW,
  TD_COS_EC,
  TD_COS_I,
  TD_CW,
  TD_E,
  TD_MC,
  TD_MC_DE,
  TD_MC_DW,
  TD_N,
  TD_PERIOD,
  TD_ROOT,
  TD_SCALED_AXIS,
  TD_SIN_EC,
  TD_SW,
  TD_TC,
} from './transitParameters.js';

const kepler = new Float64Array(3);
// Intermediates of the last separationInto call, read by separationPartialsInto:
// [t - tc, sin E, cos E, C, S, z] (a typed array: module-level numbers would be boxed).
const last = new Float64Array(6);

/** Largest |E - E_c| for the series below (truncation under 1e-18 there). */
const SERIES_LIMIT = 0.7;
// Reciprocals 1/((2j)(2j+1)) and 1/((2j-1)(2j)) for the Horner forms of sin and cos
// (multiplications: a chain of divisions would be several times slower).
const S1 = 1 / 6;
const S2 = 1 / 20;
const S3 = 1 / 42;
const S4 = 1 / 72;
const S5 = 1 / 110;
const S6 = 1 / 156;
const S7 = 1 / 210;
const S8 = 1 / 272;
const C2 = 1 / 12;
const C3 = 1 / 30;
const C4 = 1 / 56;
const C5 = 1 / 90;
const C6 = 1 / 132;
const C7 = 1 / 182;
const C8 = 1 / 240;

/**
 * Writes sin E, cos E into out[1], out[2] for E = E_c + δ solving Kepler's equation at
 * M = M_c + dM (dM read from out[0]), with sin E_c = sEc, cos E_c = cEc of the decoded
 * planet at d0[o..], by Halley's method in δ (cubic
 * convergence). Since M_c = E_c - e sin E_c, the residual is
 * f(δ) = δ - e (sin E - sin E_c) - dM, with f' = 1 - e cos E and f'' = e sin E.
 * sin δ and cos δ - 1 come from their Taylor series to δ^17 and δ^16 at the first
 * iterate; later, small steps h rotate (sin E, cos E) by angle addition with the
 * series of sin h, cos h to h^7, h^8 (truncation below 1e-21 for |h| < 0.02). For
 * |δ| < 1/4 at the start, shorter series (to δ^11, δ^12) are used.
 * Returns false (writing nothing) when |δ| would leave the series' range or the
 * iteration does not settle.
 */
function keplerNearConjunction(d0: Float64Array, o: number, out: Float64Array): boolean {
  // dM arrives in out[0] and the planet's constants are read here, not passed: doubles
  // passed to this call, which V8 does not inline, would be boxed once per point.
  const dM = out[0];
  const e = d0[o + TD_E];
  const sEc = d0[o + TD_SIN_EC];
  const cEc = d0[o + TD_COS_EC];
  let d = dM / (1 - e * cEc);
  if (!(Math.abs(d) < 0.5)) return false;
  let sinE = 0;
  let cosE = 0;
  let fresh = true;
  for (let iter = 0; iter < 8; iter++) {
    if (fresh) {
      const d2 = d * d;
      let sd: number;
      let cm1: number;
      if (iter === 0 && d2 < 0.0625) {
        // |δ| < 1/4: series to δ^11 and δ^12 suffice (truncation below 3e-18).
        sd = d * (1 - d2 * S1 * (1 - d2 * S2 * (1 - d2 * S3 * (1 - d2 * S4 * (1 - d2 * S5)))));
        cm1 = -0.5 * d2 * (1 - d2 * C2 * (1 - d2 * C3 * (1 - d2 * C4 * (1 - d2 * C5 * (1 - d2 * C6)))));
      } else {
        sd = d * (1 - d2 * S1 * (1 - d2 * S2 * (1 - d2 * S3 * (1 - d2 * S4 * (1 - d2 * S5 * (1 - d2 * S6 * (1 - d2 * S7 * (1 - d2 * S8))))))));
        cm1 = -0.5 * d2 * (1 - d2 * C2 * (1 - d2 * C3 * (1 - d2 * C4 * (1 - d2 * C5 * (1 - d2 * C6 * (1 - d2 * C7 * (1 - d2 * C8)))))));
      }
      sinE = sEc + (sEc * cm1 + cEc * sd);
      cosE = cEc + (cEc * cm1 - sEc * sd);
      fresh = false;
    }
    const inv = 1 / (1 - e * cosE);
    const newton = (d - e * (sinE - sEc) - dM) * inv;
    const h = newton / (1 - 0.5 * newton * e * sinE * inv);
    d -= h;
    if (!(Math.abs(d) < SERIES_LIMIT)) return false;
    if (Math.abs(h) < 0.02) {
      const h2 = h * h;
      const sh = h * (1 - h2 * S1 * (1 - h2 * S2 * (1 - h2 * S3)));
      const ch = 1 - 0.5 * h2 * (1 - h2 * C2 * (1 - h2 * C3 * (1 - h2 * C4)));
      const s = sinE * ch - cosE * sh;
      cosE = cosE * ch + sinE * sh;
      sinE = s;
      // Halley's cubic convergence leaves an error of order e h³/(1 - e)² after a
      // step h, below 1e-18 rad once |h| < 1e-6 (1 - e).
      if (Math.abs(h) < 1e-6 * (1 - e)) {
        out[1] = sinE;
        out[2] = cosE;
        return true;
      }
    } else {
      fresh = true;
    }
  }
  return false;
}

/**
 * Separation at time `t` (days, same epoch as tc) for the decoded planet at `d[o..]`;
 * writes z (stellar radii) at out[at] and returns true when the planet is in front of
 * the star (Z > 0). Keeps its intermediates for {@link separationPartialsInto}.
 * No input checks.
 */
export function separationInto(t: number, d: Float64Array, o: number, out: Float64Array, at: number): boolean {
  out[at] = t;
  return separationInPlace(d, o, out, at);
}

/**
 * {@link separationInto} with the time read from out[at] (and z written there), for
 * loops over points: a time computed per point and passed to this call, which V8 does
 * not inline, would be boxed, one heap allocation per point. Same results, bit for bit.
 */
export function separationInPlace(d: Float64Array, o: number, out: Float64Array, at: number): boolean {
  const t = out[at];
  const e = d[o + TD_E];
  const aR = d[o + TD_SCALED_AXIS];
  const root = d[o + TD_ROOT];
  const sw = d[o + TD_SW];
  const cw = d[o + TD_CW];
  const ci = d[o + TD_COS_I];
  const n = d[o + TD_N];
  const P = d[o + TD_PERIOD];
  const dt = t - d[o + TD_TC];
  const dM = n * (dt - P * Math.round(dt / P));
  kepler[0] = dM;
  if (!keplerNearConjunction(d, o, kepler)) {
    solveKeplerInto(n * dt + d[o + TD_MC], e, kepler, 0);
  }
  const sE = kepler[1];
  const cE = kepler[2];
  const x = aR * (cE - e);
  const y = aR * root * sE;
  const C = x * cw - y * sw;
  const S = x * sw + y * cw;
  const z = Math.sqrt(C * C + S * S * ci * ci);
  last[0] = dt;
  last[1] = sE;
  last[2] = cE;
  last[3] = C;
  last[4] = S;
  last[5] = z;
  out[at] = z;
  return S > 0;
}

/**
 * Partial derivatives of the separation computed by the last {@link separationInto}
 * call (same planet `d[o..]`): writes ∂z/∂P, ∂z/∂tc, ∂z/∂e, ∂z/∂omega, ∂z/∂(a/R_*),
 * ∂z/∂(b or i) at out[at..at+5]. At z = 0 they are set to 0 (z is not differentiable
 * there, but every smooth function of z², such as the flux, has a zero derivative).
 */
export function separationPartialsInto(d: Float64Array, o: number, out: Float64Array, at: number): void {
  const z = last[5];
  if (z === 0) {
    for (let i = 0; i < 6; i++) out[at + i] = 0;
    return;
  }
  const e = d[o + TD_E];
  const aR = d[o + TD_SCALED_AXIS];
  const root = d[o + TD_ROOT];
  const sw = d[o + TD_SW];
  const cw = d[o + TD_CW];
  const ci = d[o + TD_COS_I];
  const n = d[o + TD_N];
  const sE = last[1];
  const cE = last[2];
  const C = last[3];
  const S = last[4];
  const ci2 = ci * ci;
  const invZ = 1 / z;
  const iD = 1 / (1 - e * cE);
  // Derivatives of (x, y) along E.
  const xE = -aR * sE;
  const yE = aR * root * cE;
  const CE = xE * cw - yE * sw;
  const SE = xE * sw + yE * cw;
  const zM = (C * CE + S * ci2 * SE) * invZ * iD; // ∂z/∂M
  out[at] = zM * ((-n * last[0]) / d[o + TD_PERIOD]);
  out[at + 1] = -zM * n;
  // Eccentricity: through E (at fixed M and via M_c), x, y directly, and cos i.
  const dEde = iD * (sE + d[o + TD_MC_DE]);
  const xe = xE * dEde - aR;
  const ye = yE * dEde - (aR * e * sE) / root;
  const Ce = xe * cw - ye * sw;
  const Se = xe * sw + ye * cw;
  const S2ci = S * S * ci;
  out[at + 2] = (C * Ce + S * ci2 * Se + S2ci * d[o + TD_CI_DE]) * invZ;
  // Argument of periastron: through M_c, the rotation (∂C/∂omega = -S,
  // ∂S/∂omega = C) and cos i.
  const dEdw = iD * d[o + TD_MC_DW];
  const Cw = CE * dEdw - S;
  const Sw = SE * dEdw + C;
  out[at + 3] = (C * Cw + S * ci2 * Sw + S2ci * d[o + TD_CI_DW]) * invZ;
  out[at + 4] = ((z * z) / aR + S2ci * d[o + TD_CI_DA]) * invZ;
  out[at + 5] = S2ci * d[o + TD_CI_DANGLE] * invZ;
}

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
 */
import { solveKeplerInto } from '../orbit/kepler.js';
import {
  TD_CI_DA,
  TD_CI_DANGLE,
  TD_CI_DE,
  TD_CI_DW,
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
  TD_SW,
  TD_TC,
} from './transitParameters.js';

/** Offsets written by {@link separationInto}: z, then ∂z/∂(P, tc, e, omega, a/R_*, angle). */
export const SEP_Z = 0;
export const SEP_SIZE = 7;

const kepler = new Float64Array(3);

/**
 * Separation at time `t` (days, same epoch as tc) for the decoded planet at
 * `d[o..]`; writes z at out[at] and, when `withPartials`, ∂z/∂P, ∂z/∂tc, ∂z/∂e,
 * ∂z/∂omega, ∂z/∂(a/R_*), ∂z/∂(b or i) at out[at+1..at+6]. Returns true when the
 * planet is in front of the star (Z > 0). At z = 0 the partials are set to 0 (z is
 * not differentiable there, but every smooth function of z², such as the flux, has a
 * zero derivative). No input checks.
 */
export function separationInto(
  t: number,
  d: Float64Array,
  o: number,
  withPartials: boolean,
  out: Float64Array,
  at: number,
): boolean {
  const e = d[o + TD_E];
  const aR = d[o + TD_SCALED_AXIS];
  const root = d[o + TD_ROOT];
  const sw = d[o + TD_SW];
  const cw = d[o + TD_CW];
  const ci = d[o + TD_COS_I];
  const n = d[o + TD_N];
  const dt = t - d[o + TD_TC];
  solveKeplerInto(n * dt + d[o + TD_MC], e, kepler, 0);
  const sE = kepler[1];
  const cE = kepler[2];
  const x = aR * (cE - e);
  const y = aR * root * sE;
  const C = x * cw - y * sw;
  const S = x * sw + y * cw;
  const ci2 = ci * ci;
  const z2 = C * C + S * S * ci2;
  const z = Math.sqrt(z2);
  out[at] = z;
  if (withPartials) {
    if (z === 0) {
      for (let i = 1; i < 7; i++) out[at + i] = 0;
    } else {
      const invZ = 1 / z;
      const iD = 1 / (1 - e * cE);
      // Derivatives of (x, y) along E.
      const xE = -aR * sE;
      const yE = aR * root * cE;
      const CE = xE * cw - yE * sw;
      const SE = xE * sw + yE * cw;
      const zE = (C * CE + S * ci2 * SE) * invZ; // ∂z/∂E
      const zM = zE * iD; // ∂z/∂M
      out[at + 1] = zM * ((-n * dt) / d[o + TD_PERIOD]);
      out[at + 2] = -zM * n;
      // Eccentricity: through E (at fixed M and via M_c), x, y directly, and cos i.
      const dEde = iD * (sE + d[o + TD_MC_DE]);
      const xe = xE * dEde - aR;
      const ye = yE * dEde - (aR * e * sE) / root;
      const Ce = xe * cw - ye * sw;
      const Se = xe * sw + ye * cw;
      const S2ci = S * S * ci;
      out[at + 3] = (C * Ce + S * ci2 * Se + S2ci * d[o + TD_CI_DE]) * invZ;
      // Argument of periastron: through M_c, the rotation (∂C/∂omega = -S,
      // ∂S/∂omega = C) and cos i.
      const dEdw = iD * d[o + TD_MC_DW];
      const Cw = CE * dEdw - S;
      const Sw = SE * dEdw + C;
      out[at + 4] = (C * Cw + S * ci2 * Sw + S2ci * d[o + TD_CI_DW]) * invZ;
      out[at + 5] = (z2 / aR + S2ci * d[o + TD_CI_DA]) * invZ;
      out[at + 6] = S2ci * d[o + TD_CI_DANGLE] * invZ;
    }
  }
  return S > 0;
}

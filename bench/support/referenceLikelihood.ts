/**
 * A hand-written, fused float64 log-likelihood with its exact gradient for the shipped
 * planetary-system models (radial velocities and transit light curves), written for the
 * benchmarks only as the practical limit the shipped models are measured against: one
 * pass over the data, every planet of a point handled before the next point, the
 * gradient accumulated as per-planet sums while the residual is known, no intermediate
 * arrays, no checks beyond what the mathematics needs.
 *
 * It evaluates the same likelihood as `model.structure.likelihood.evaluate(Φ, grad)` of
 * `@apsis/models`, over the same physical vector Φ (read through the model's layout;
 * the check in `referenceCheck.ts` compares values and gradients), but shares no code
 * with it except the scalar limb-darkened flux: the occulted-disk integrals of Mandel &
 * Agol (2002) with their partials (`quadraticFluxPartialsUnchecked`) are called per
 * in-transit point. Everything else (Kepler's equation, the orbit, the sky separation,
 * the transit window, the chain rules, the Gaussian likelihood) is written here. The
 * flux formula runs only for the few per cent of points inside a transit window, so
 * sharing it moves the ratio very little; its own cost is in bench/transit-kernel.ts.
 *
 * Model (same conventions as the builders; Winn 2010 for the geometry):
 *   RV:  mu_i = Σ_p K_p [cos(ω_p + f_p) + e_p cos ω_p] + offset_j + c1 τ_i + c2 τ_i²,
 *        var_i = σ_i² + s_j²,  log L = −½ Σ [(y_i − mu_i)²/var_i + ln(2π var_i)]
 *   LC:  m_i = f0 (1 − Σ_p (1 − F_p(z_p(t_i)))), var_i = σ_i² + s², same Gaussian form,
 *        z² = C² + S² cos² i, C = r cos(ω + f), S = r sin(ω + f), in front when S > 0,
 *        cos i = b (1 + e sin ω)/((a/R_*)(1 − e²)), a/R_* = (G ρ P²/(3π))^(1/3) in the
 *        density geometry (Seager & Mallén-Ornelas 2003), (u1, u2) from Kipping's
 *        (q1, q2) (Kipping 2013).
 *   Φ holds (h, k) = (√e cos ω, √e sin ω) for the eccentricity.
 * Supported: any number of planets and instruments, trends of degree ≤ 2, light curves
 * without dilution and with one sub-sample per exposure (the benchmark scenarios).
 */
import { quadraticFluxPartialsUnchecked, type PlanetSystemModel } from '@apsis/models';

const TWO_PI = 2 * Math.PI;
const LN_2PI = Math.log(TWO_PI);
/** G (CODATA 2018, m³ kg⁻¹ s⁻²) × 1000 (g/cm³ → kg/m³) × 86400² (days → s) / (3π). */
const DENSITY_FACTOR = (6.6743e-11 * 1000 * 86400 * 86400) / (3 * Math.PI);
/** Points per logarithm when summing ln var_i as the log of a product (var in 1e-19 … 1e19). */
const LOG_BLOCK = 16;

/** Eccentric anomaly E, sin E, cos E for mean anomaly M and eccentricity e < 1, into out[0..2]. */
export function solveKeplerReference(M: number, e: number, out: Float64Array): void {
  // Reduce M to [−π, π); E − M has period 2π.
  const turns = Math.round(M / TWO_PI);
  const m = M - turns * TWO_PI;
  const sm = Math.sin(m);
  const cm = Math.cos(m);
  // Second-order starter E = M + e sin M (1 + e cos M), then Halley's method, which
  // triples the number of correct digits per step; once a step is below 3e-6 the next
  // would be below 1e-16, so sin E and cos E are carried to the last step by series.
  let E = m + e * sm * (1 + e * cm);
  let s = 0;
  let c = 0;
  let d = 0;
  for (let it = 0; it < 12; it++) {
    s = Math.sin(E);
    c = Math.cos(E);
    const f = E - e * s - m;
    const f1 = 1 - e * c;
    d = f / (f1 - (0.5 * f * e * s) / f1);
    E -= d;
    if (Math.abs(d) < 3e-6) break;
  }
  const half = 0.5 * d * d;
  out[0] = E + turns * TWO_PI;
  out[1] = s - d * c - half * s;
  out[2] = c + d * s - half * c;
}

/**
 * Kepler's equation near a known point: with E_c (sin, cos given) solving it at M_c,
 * solves E = E_c + δ at M = M_c + dM for |dM| ≤ 0.5 by Halley's method in δ, with sin δ
 * and cos δ from their Taylor series (truncation below 3e-17 for |δ| ≤ 0.5) and sin E,
 * cos E by angle addition: no trigonometric call. Writes sin E, cos E into out[1], out[2]
 * (out[0] = δ). Returns false (out untouched) when |dM| > 0.5 or it does not settle.
 */
export function solveKeplerNear(dM: number, e: number, sinEc: number, cosEc: number, out: Float64Array): boolean {
  if (!(Math.abs(dM) <= 0.5)) return false;
  let d = dM / (1 - e * cosEc);
  for (let it = 0; it < 8; it++) {
    if (!(Math.abs(d) <= 0.6)) return false;
    const d2 = d * d;
    // sin δ and cos δ − 1 to δ^15 and δ^16.
    const sd = d * (1 - (d2 / 6) * (1 - (d2 / 20) * (1 - (d2 / 42) * (1 - (d2 / 72) * (1 - (d2 / 110) * (1 - (d2 / 156) * (1 - d2 / 210)))))));
    const cm1 = -(d2 / 2) * (1 - (d2 / 12) * (1 - (d2 / 30) * (1 - (d2 / 56) * (1 - (d2 / 90) * (1 - (d2 / 132) * (1 - (d2 / 182) * (1 - d2 / 240)))))));
    const sE = sinEc + sinEc * cm1 + cosEc * sd;
    const cE = cosEc + cosEc * cm1 - sinEc * sd;
    // g(δ) = δ − e (sin E − sin E_c) − dM, g' = 1 − e cos E, g'' = e sin E.
    const g = d - e * (sE - sinEc) - dM;
    const g1 = 1 - e * cE;
    const step = g / (g1 - (0.5 * g * e * sE) / g1);
    d -= step;
    if (Math.abs(step) < 3e-6) {
      const half = 0.5 * step * step;
      out[0] = d;
      out[1] = sE - step * cE - half * sE;
      out[2] = cE + step * sE - half * cE;
      return true;
    }
  }
  return false;
}

/** The reference likelihood bound to one model's data and layout. */
export interface ReferenceLikelihood {
  /** log L at Φ; writes ∂ log L/∂Φ into `grad` (every slot, zeros where Φ is not used). */
  evaluate(phi: Float64Array, grad: Float64Array): number;
}

interface LayoutLike {
  readonly length: number;
  readonly period: Int32Array;
  readonly tc: Int32Array;
  readonly eccentricity: Int32Array;
  readonly semiAmplitude: Int32Array;
  readonly radiusRatio: Int32Array;
  readonly impact: Int32Array;
  readonly scaledAxis: Int32Array;
  readonly density: number;
  readonly offset: Int32Array;
  readonly jitter: Int32Array;
  readonly trend: Int32Array;
  readonly limbFirst: Int32Array;
  readonly limbSecond: Int32Array;
  readonly baseline: Int32Array;
  readonly fluxJitter: Int32Array;
  readonly dilution: Int32Array;
}

/** Per-planet orbit constants, filled once per call. */
const PL = 18;
const P_PERIOD = 0;
const P_TC = 1;
const P_E = 2;
const P_SW = 3;
const P_CW = 4;
const P_ROOT = 5;
const P_N = 6;
const P_MC = 7;
const P_MC_DE = 8;
const P_MC_DW = 9;
const P_K = 10; // semi-amplitude (RV) or radius ratio (LC)
const P_AR = 11;
const P_CI = 12;
const P_LO = 13; // transit window, days from tc: [lo, hi] modulo P
const P_HI = 14;
const P_WINDOW = 15; // 0 none (every point), 1 window, 2 never overlaps
const P_SEC = 16; // sin E_c
const P_CEC = 17; // cos E_c

/** Fills the orbit constants of a planet from Φ; returns false outside the support. */
function orbitInto(phi: Float64Array, layout: LayoutLike, i: number, out: Float64Array, o: number): boolean {
  const P = phi[layout.period[i]];
  const h = phi[layout.eccentricity[i]];
  const k = phi[layout.eccentricity[i] + 1];
  const e = h * h + k * k;
  if (!(P > 0) || !(e < 1)) return false;
  const se = Math.sqrt(e);
  const sw = se > 0 ? k / se : 0;
  const cw = se > 0 ? h / se : 1;
  const root = Math.sqrt((1 - e) * (1 + e));
  const den = 1 + e * sw;
  // Conjunction f_c = π/2 − ω: sin f_c = cos ω, cos f_c = sin ω.
  const Ec = Math.atan2(root * cw, e + sw);
  out[o + P_PERIOD] = P;
  out[o + P_TC] = phi[layout.tc[i]];
  out[o + P_E] = e;
  out[o + P_SW] = sw;
  out[o + P_CW] = cw;
  out[o + P_ROOT] = root;
  out[o + P_N] = TWO_PI / P;
  out[o + P_MC] = Ec - (e * root * cw) / den;
  out[o + P_SEC] = (root * cw) / den;
  out[o + P_CEC] = (e + sw) / den;
  out[o + P_MC_DE] = (-root * cw * (2 + e * sw)) / (den * den);
  out[o + P_MC_DW] = -(root * root * root) / (den * den);
  return true;
}

/** Mean anomaly at true anomaly f. */
function meanAt(f: number, e: number, root: number): number {
  const sf = Math.sin(f);
  const cf = Math.cos(f);
  const E = Math.atan2(root * sf, e + cf);
  return E - (e * root * sf) / (1 + e * cf);
}

function wrap(x: number): number {
  const r = x - TWO_PI * Math.floor(x / TWO_PI);
  return r;
}

/**
 * Transit geometry of a planet (after orbitInto): a/R_*, cos i and the window. Overlap
 * needs z < 1 + k in front of the star; since z² = C² sin² i + r² cos² i and
 * |C| ≥ r_min |cos(ω + f)| with r_min = a(1 − e), it needs
 * |cos(ω + f)| < √((1 + k)² − r_min² cos² i)/(r_min sin i).
 */
function transitInto(aR: number, b: number, k: number, out: Float64Array, o: number): boolean {
  const e = out[o + P_E];
  const sw = out[o + P_SW];
  const root = out[o + P_ROOT];
  if (!(aR > 1) || !(k > 0)) return false;
  // b may be negative (the orbit's other side of the stellar equator): only cos² i enters z.
  const ci = (b * (1 + e * sw)) / (aR * root * root);
  if (!(Math.abs(ci) < 1)) return false;
  const si = Math.sqrt((1 - ci) * (1 + ci));
  out[o + P_K] = k;
  out[o + P_AR] = aR;
  out[o + P_CI] = ci;
  const rMin = aR * (1 - e);
  const reach2 = (1 + k) * (1 + k) - rMin * rMin * ci * ci;
  if (!(reach2 > 0)) {
    out[o + P_WINDOW] = 2;
    return true;
  }
  const c0 = Math.sqrt(reach2) / (rMin * si);
  if (!(c0 < 1)) {
    out[o + P_WINDOW] = 0;
    return true;
  }
  const half = Math.asin(c0);
  const fc = 0.5 * Math.PI - Math.atan2(sw, out[o + P_CW]);
  const Mc = out[o + P_MC];
  const n = out[o + P_N];
  const before = wrap(Mc - meanAt(fc - half, e, root));
  const after = wrap(meanAt(fc + half, e, root) - Mc);
  if (!(before + after < TWO_PI * 0.999)) {
    out[o + P_WINDOW] = 0;
    return true;
  }
  const P = out[o + P_PERIOD];
  const margin = 1e-9 * P;
  out[o + P_LO] = -before / n - margin;
  out[o + P_HI] = after / n + margin;
  out[o + P_WINDOW] = 1;
  return true;
}

/** Builds the reference likelihood for a shipped model (see the file notes). */
export function createReferenceLikelihood(model: PlanetSystemModel): ReferenceLikelihood {
  const system = model.structure.system;
  const layout = model.structure.plan.layout as unknown as LayoutLike;
  const transiting = model.structure.plan.transiting;
  const bandOf = model.structure.plan.bandOf;
  const epoch = system.epoch;
  const nPlanets = system.planets.length;
  const rvPlanets: number[] = [];
  for (let i = 0; i < nPlanets; i++) if (layout.semiAmplitude[i] >= 0) rvPlanets.push(i);
  const kipping = system.limbDarkening === 'kipping';
  const densityGeometry = layout.density >= 0;
  for (const lc of system.lightCurves) {
    if (lc.dilution) throw new Error('reference likelihood: dilution is not supported');
    if (lc.subSamples !== 1) throw new Error(`reference likelihood: ${lc.subSamples} sub-samples per exposure; only 1 is supported`);
  }

  const rv = system.rv
    ? {
        t: system.rv.times.map((x) => x - epoch),
        y: system.rv.values,
        err2: system.rv.errors.map((x) => x * x),
        inst: system.rv.instrument,
        J: system.rv.labels.length,
      }
    : null;
  // Light curves in time order, so that each planet's transit windows are met in turn
  // while sweeping through the points (two comparisons per point and planet outside them).
  const lcs = system.lightCurves.map((lc) => {
    const order = Array.from(lc.times, (_, i) => i).sort((a, b) => lc.times[a] - lc.times[b]);
    return {
      t: Float64Array.from(order, (i) => lc.times[i] - epoch),
      y: Float64Array.from(order, (i) => lc.flux[i]),
      err2: Float64Array.from(order, (i) => lc.errors[i] * lc.errors[i]),
    };
  });

  const orbits = new Float64Array(nPlanets * PL);
  const np = rvPlanets.length;
  // Per RV planet: accumulated sums (A, S·FM, S·FM·(t − tc), S·FE, S) and per-point values.
  const rvSums = new Float64Array(np * 5);
  const pointA = new Float64Array(np);
  const pointS = new Float64Array(np);
  const pointFM = new Float64Array(np);
  const pointFE = new Float64Array(np);
  const pointDt = new Float64Array(np);
  const kepler = new Float64Array(3);
  const offsetSums = new Float64Array(rv ? rv.J : 0);
  const jitterSums = new Float64Array(rv ? rv.J : 0);
  const nT = transiting.length;
  // Per transiting planet: Σ gM, Σ gM (t − tc), Σ gE ∂E/∂e, Σ gz ∂z/∂e|E, Σ gz ∂z/∂ω|E, Σ gz z, Σ gz ∂z/∂ci, Σ gF ∂F/∂k.
  const lcSums = new Float64Array(nT * 8);
  const flux = new Float64Array(5);
  const limbSums = new Float64Array(2);

  function rvPart(phi: Float64Array, grad: Float64Array): number {
    if (rv === null) return 0;
    const { t, y, err2, inst, J } = rv;
    for (const i of rvPlanets) if (!orbitInto(phi, layout, i, orbits, i * PL)) return -Infinity;
    const Ks = rvPlanets.map((i) => phi[layout.semiAmplitude[i]]);
    rvSums.fill(0);
    offsetSums.fill(0);
    jitterSums.fill(0);
    const c1 = layout.trend.length > 0 ? phi[layout.trend[0]] : 0;
    const c2 = layout.trend.length > 1 ? phi[layout.trend[1]] : 0;
    let g1 = 0;
    let g2 = 0;
    let chi2 = 0;
    let logProduct = 0;
    let product = 1;
    const n = t.length;
    for (let q = 0; q < n; q++) {
      const tq = t[q];
      let mu = 0;
      for (let p = 0; p < np; p++) {
        const o = rvPlanets[p] * PL;
        const e = orbits[o + P_E];
        const root = orbits[o + P_ROOT];
        const sw = orbits[o + P_SW];
        const cw = orbits[o + P_CW];
        const dt = tq - orbits[o + P_TC];
        solveKeplerReference(orbits[o + P_N] * dt + orbits[o + P_MC], e, kepler);
        const sE = kepler[1];
        const cE = kepler[2];
        const inv = 1 / (1 - e * cE);
        const cf = (cE - e) * inv;
        const sf = root * sE * inv;
        const A = cw * cf - sw * sf + e * cw;
        pointA[p] = A;
        pointS[p] = sw * cf + cw * sf;
        pointFM[p] = root * inv * inv;
        pointFE[p] = sE * inv * (1 / root + root * inv);
        pointDt[p] = dt;
        mu += Ks[p] * A;
      }
      const j = inst[q];
      const s = phi[layout.jitter[j]];
      mu += phi[layout.offset[j]] + tq * (c1 + tq * c2);
      const v = err2[q] + s * s;
      const w = 1 / v;
      const r = y[q] - mu;
      const gm = r * w;
      chi2 += r * gm;
      product *= v;
      if ((q & (LOG_BLOCK - 1)) === LOG_BLOCK - 1) {
        logProduct += Math.log(product);
        product = 1;
      }
      offsetSums[j] += gm;
      jitterSums[j] += gm * gm - w;
      g1 += gm * tq;
      g2 += gm * tq * tq;
      for (let p = 0; p < np; p++) {
        const a = p * 5;
        const gs = gm * pointS[p];
        const gsfm = gs * pointFM[p];
        rvSums[a] += gm * pointA[p];
        rvSums[a + 1] += gsfm;
        rvSums[a + 2] += gsfm * pointDt[p];
        rvSums[a + 3] += gs * pointFE[p];
        rvSums[a + 4] += gs;
      }
    }
    logProduct += Math.log(product);
    let sumG = 0;
    for (let j = 0; j < J; j++) {
      sumG += offsetSums[j];
      grad[layout.offset[j]] += offsetSums[j];
      grad[layout.jitter[j]] += phi[layout.jitter[j]] * jitterSums[j];
    }
    if (layout.trend.length > 0) grad[layout.trend[0]] += g1;
    if (layout.trend.length > 1) grad[layout.trend[1]] += g2;
    for (let p = 0; p < np; p++) {
      const i = rvPlanets[p];
      const o = i * PL;
      const a = p * 5;
      const K = Ks[p];
      const e = orbits[o + P_E];
      const n0 = orbits[o + P_N];
      const sw = orbits[o + P_SW];
      const cw = orbits[o + P_CW];
      grad[layout.semiAmplitude[i]] += rvSums[a];
      grad[layout.tc[i]] += K * n0 * rvSums[a + 1];
      grad[layout.period[i]] += ((K * n0) / orbits[o + P_PERIOD]) * rvSums[a + 2];
      const ge = K * (cw * sumG - rvSums[a + 3] - orbits[o + P_MC_DE] * rvSums[a + 1]);
      const gw = K * (-rvSums[a + 4] - e * sw * sumG - orbits[o + P_MC_DW] * rvSums[a + 1]);
      addEccentricityGradient(phi, grad, layout.eccentricity[i], e, ge, gw);
    }
    return -0.5 * (chi2 + logProduct + n * LN_2PI);
  }

  function lcPart(phi: Float64Array, grad: Float64Array, s: number): number {
    const { t, y, err2 } = lcs[s];
    const band = bandOf[s];
    const a = phi[layout.limbFirst[band]];
    const b2 = phi[layout.limbSecond[band]];
    let u1: number;
    let u2: number;
    if (kipping) {
      if (!(a > 0 && a <= 1 && b2 >= 0 && b2 <= 1)) return -Infinity;
      const ra = Math.sqrt(a);
      u1 = 2 * ra * b2;
      u2 = ra * (1 - 2 * b2);
    } else {
      u1 = a;
      u2 = b2;
    }
    for (const i of transiting) {
      const o = i * PL;
      if (!orbitInto(phi, layout, i, orbits, o)) return -Infinity;
      const P = orbits[o + P_PERIOD];
      const aR = densityGeometry ? Math.cbrt(DENSITY_FACTOR * phi[layout.density] * P * P) : phi[layout.scaledAxis[i]];
      if (!transitInto(aR, phi[layout.impact[i]], phi[layout.radiusRatio[i]], orbits, o)) return -Infinity;
    }
    const f0 = phi[layout.baseline[s]];
    const sj = phi[layout.fluxJitter[s]];
    const s2 = sj * sj;
    lcSums.fill(0);
    limbSums.fill(0);
    let chi2 = 0;
    let logProduct = 0;
    let product = 1;
    let gf0 = 0;
    let gs = 0;
    const n = t.length;
    // Window sweep: for each planet, the current window [start, end] (days, relative
    // to the epoch); windows are [tc + lo + mP, tc + hi + mP].
    for (let j = 0; j < nT; j++) {
      const o = transiting[j] * PL;
      const kind = orbits[o + P_WINDOW];
      const P = orbits[o + P_PERIOD];
      const tc = orbits[o + P_TC];
      sweep[j * 4] = kind;
      if (kind === 1) {
        const m = Math.ceil((t[0] - tc - orbits[o + P_HI]) / P);
        sweep[j * 4 + 1] = m;
        sweep[j * 4 + 2] = tc + orbits[o + P_LO] + m * P;
        sweep[j * 4 + 3] = tc + orbits[o + P_HI] + m * P;
      }
    }
    acc[0] = 0;
    acc[1] = 0;
    acc[2] = 1;
    acc[3] = 0;
    acc[4] = 0;
    let q = 0;
    while (q < n) {
      // Points before the earliest window start of any planet need only the residual.
      const until = nextWindowStart(t[q]);
      if (t[q] < until) {
        q = plainPoints(t, y, err2, q, until, f0, s2, acc);
        continue;
      }
      windowPoint(t, y, err2, q, f0, s2, u1, u2);
      q++;
    }
    chi2 = acc[0];
    logProduct = acc[1];
    product = acc[2];
    gf0 = acc[3];
    gs = acc[4];
    logProduct += Math.log(product);
    grad[layout.baseline[s]] += gf0;
    grad[layout.fluxJitter[s]] += sj * gs;
    if (kipping) {
      const ra = Math.sqrt(a);
      grad[layout.limbFirst[band]] += limbSums[0] * (b2 / ra) + limbSums[1] * ((1 - 2 * b2) / (2 * ra));
      grad[layout.limbSecond[band]] += limbSums[0] * 2 * ra - limbSums[1] * 2 * ra;
    } else {
      grad[layout.limbFirst[band]] += limbSums[0];
      grad[layout.limbSecond[band]] += limbSums[1];
    }
    for (let j = 0; j < nT; j++) {
      const i = transiting[j];
      const o = i * PL;
      const sums = j * 8;
      const P = orbits[o + P_PERIOD];
      const n0 = orbits[o + P_N];
      const e = orbits[o + P_E];
      const aR = orbits[o + P_AR];
      const root = orbits[o + P_ROOT];
      const sw = orbits[o + P_SW];
      const cw = orbits[o + P_CW];
      const ci = orbits[o + P_CI];
      const b = phi[layout.impact[i]];
      const sumCi = lcSums[sums + 6];
      const den = 1 + e * sw;
      const r2 = root * root;
      const dciDe = (b * (sw * r2 + 2 * e * den)) / (aR * r2 * r2);
      const dciDw = (b * e * cw) / (aR * r2);
      let gP = (-n0 / P) * lcSums[sums + 1];
      const ge = orbits[o + P_MC_DE] * lcSums[sums] + lcSums[sums + 2] + lcSums[sums + 3] + dciDe * sumCi;
      const gw = orbits[o + P_MC_DW] * lcSums[sums] + lcSums[sums + 4] + dciDw * sumCi;
      const gaR = lcSums[sums + 5] / aR - (ci / aR) * sumCi;
      grad[layout.tc[i]] += -n0 * lcSums[sums];
      grad[layout.impact[i]] += (den / (aR * r2)) * sumCi;
      grad[layout.radiusRatio[i]] += lcSums[sums + 7];
      if (densityGeometry) {
        gP += gaR * ((2 * aR) / (3 * P));
        grad[layout.density] += gaR * (aR / (3 * phi[layout.density]));
      } else {
        grad[layout.scaledAxis[i]] += gaR;
      }
      grad[layout.period[i]] += gP;
      addEccentricityGradient(phi, grad, layout.eccentricity[i], e, ge, gw);
    }
    return -0.5 * (chi2 + logProduct + n * LN_2PI);
  }
  const scratch = new Float64Array(Math.max(nT, 1) * 8);
  const sweep = new Float64Array(Math.max(nT, 1) * 4);
  const acc = new Float64Array(5);

  /** Advances each planet's window sweep past `tq` and returns the earliest window start (−∞: a planet without a window). */
  function nextWindowStart(tq: number): number {
    let until = Infinity;
    for (let j = 0; j < nT; j++) {
      const w4 = j * 4;
      const kind = sweep[w4];
      if (kind === 2) continue;
      if (kind === 0) return -Infinity;
      if (tq > sweep[w4 + 3]) {
        const o = transiting[j] * PL;
        const P = orbits[o + P_PERIOD];
        const m = Math.ceil((tq - orbits[o + P_TC] - orbits[o + P_HI]) / P);
        sweep[w4 + 1] = m;
        sweep[w4 + 2] = orbits[o + P_TC] + orbits[o + P_LO] + m * P;
        sweep[w4 + 3] = orbits[o + P_TC] + orbits[o + P_HI] + m * P;
      }
      if (sweep[w4 + 2] < until) until = sweep[w4 + 2];
    }
    return until;
  }

  /**
   * Points from `from` while t < `until`: out of every transit, so the model is f0 and only
   * the residual sums change (acc: χ², Σ ln var in blocks, running product, ∂/∂f0, ∂/∂s / s).
   * Returns the index of the first point not handled.
   */
  function plainPoints(t: Float64Array, y: Float64Array, err2: Float64Array, from: number, until: number, f0: number, s2: number, acc: Float64Array): number {
    let chi2 = acc[0];
    let logProduct = acc[1];
    let product = acc[2];
    let gf0 = acc[3];
    let gs = acc[4];
    const n = t.length;
    let q = from;
    for (; q < n && t[q] < until; q++) {
      const v = err2[q] + s2;
      const w = 1 / v;
      const r = y[q] - f0;
      const gm = r * w;
      chi2 += r * gm;
      product *= v;
      if ((q & (LOG_BLOCK - 1)) === LOG_BLOCK - 1) {
        logProduct += Math.log(product);
        product = 1;
      }
      gf0 += gm;
      gs += gm * gm - w;
    }
    acc[0] = chi2;
    acc[1] = logProduct;
    acc[2] = product;
    acc[3] = gf0;
    acc[4] = gs;
    return q;
  }

  /** One point inside at least one planet's window (or with a planet that has none). */
  function windowPoint(t: Float64Array, y: Float64Array, err2: Float64Array, q: number, f0: number, s2: number, u1: number, u2: number): void {
      const tq = t[q];
      // Relative flux of all planets: 1 − Σ (1 − F_p); only planets inside their window count.
      let blocked = 0;
      let touched = -1;
      for (let j = 0; j < nT; j++) {
        const w4 = j * 4;
        const kind = sweep[w4];
        if (kind === 2) continue;
        if (kind === 1) {
          if (tq > sweep[w4 + 3]) {
            const o = transiting[j] * PL;
            const P = orbits[o + P_PERIOD];
            const m = Math.ceil((tq - orbits[o + P_TC] - orbits[o + P_HI]) / P);
            sweep[w4 + 1] = m;
            sweep[w4 + 2] = orbits[o + P_TC] + orbits[o + P_LO] + m * P;
            sweep[w4 + 3] = orbits[o + P_TC] + orbits[o + P_HI] + m * P;
          }
          if (tq < sweep[w4 + 2]) continue;
        }
        const o = transiting[j] * PL;
        const dt = tq - orbits[o + P_TC];
        const e = orbits[o + P_E];
        const n0 = orbits[o + P_N];
        // Near conjunction m (window kind 1): M − M_c = n (t − tc − mP).
        const near = kind === 1 && solveKeplerNear(n0 * (dt - sweep[w4 + 1] * orbits[o + P_PERIOD]), e, orbits[o + P_SEC], orbits[o + P_CEC], kepler);
        if (!near) solveKeplerReference(n0 * dt + orbits[o + P_MC], e, kepler);
        const sE = kepler[1];
        const cE = kepler[2];
        const aR = orbits[o + P_AR];
        const root = orbits[o + P_ROOT];
        const sw = orbits[o + P_SW];
        const cw = orbits[o + P_CW];
        const x = aR * (cE - e);
        const yy = aR * root * sE;
        const C = x * cw - yy * sw;
        const S = x * sw + yy * cw;
        if (!(S > 0)) continue;
        const ci = orbits[o + P_CI];
        const z = Math.sqrt(C * C + S * S * ci * ci);
        const k = orbits[o + P_K];
        if (!(z < 1 + k)) continue;
        const F = quadraticFluxPartialsUnchecked(z, k, u1, u2, flux, 0);
        blocked += 1 - F;
        // Keep the partials of this point in the planet's scratch row (used below, once
        // the residual is known); the sums need the geometry, so keep it too.
        const at = j * 8;
        scratch[at] = flux[1]; // ∂F/∂z
        scratch[at + 1] = flux[2]; // ∂F/∂k
        scratch[at + 2] = flux[3];
        scratch[at + 3] = flux[4];
        scratch[at + 4] = z;
        scratch[at + 5] = C;
        scratch[at + 6] = S;
        scratch[at + 7] = dt;
        scratchE[j * 3] = sE;
        scratchE[j * 3 + 1] = cE;
        scratchE[j * 3 + 2] = 1; // in transit at this point
        touched = j;
      }
      const relative = 1 - blocked;
      const m = f0 * relative;
      const v = err2[q] + s2;
      const w = 1 / v;
      const r = y[q] - m;
      const gm = r * w;
      acc[0] += r * gm;
      acc[2] *= v;
      if ((q & (LOG_BLOCK - 1)) === LOG_BLOCK - 1) {
        acc[1] += Math.log(acc[2]);
        acc[2] = 1;
      }
      acc[3] += gm * relative;
      acc[4] += gm * gm - w;
      if (touched < 0) return;
      const gF = gm * f0;
      for (let j = 0; j <= touched; j++) {
        if (scratchE[j * 3 + 2] === 0) continue;
        scratchE[j * 3 + 2] = 0;
        const o = transiting[j] * PL;
        const at = j * 8;
        const e = orbits[o + P_E];
        const aR = orbits[o + P_AR];
        const root = orbits[o + P_ROOT];
        const sw = orbits[o + P_SW];
        const cw = orbits[o + P_CW];
        const ci = orbits[o + P_CI];
        const z = scratch[at + 4];
        const C = scratch[at + 5];
        const S = scratch[at + 6];
        const sE = scratchE[j * 3];
        const cE = scratchE[j * 3 + 1];
        const gz = (gF * scratch[at]) / z; // gradient per unit z, divided by z
        const inv = 1 / (1 - e * cE);
        // ∂C/∂E, ∂S/∂E
        const dxE = -aR * sE;
        const dyE = aR * root * cE;
        const dCE = dxE * cw - dyE * sw;
        const dSE = dxE * sw + dyE * cw;
        const ci2 = ci * ci;
        const gE = gz * (C * dCE + S * ci2 * dSE);
        const gM = gE * inv;
        // ∂C/∂e|E, ∂S/∂e|E with ∂x/∂e = −a, ∂y/∂e = −a e sin E/√(1 − e²).
        const dye = (-aR * e * sE) / root;
        const dCe = -aR * cw - dye * sw;
        const dSe = -aR * sw + dye * cw;
        const sums = j * 8;
        lcSums[sums] += gM;
        lcSums[sums + 1] += gM * scratch[at + 7];
        lcSums[sums + 2] += gE * sE * inv;
        lcSums[sums + 3] += gz * (C * dCe + S * ci2 * dSe);
        lcSums[sums + 4] += gz * C * S * (ci2 - 1);
        lcSums[sums + 5] += gz * z * z;
        lcSums[sums + 6] += gz * S * S * ci;
        lcSums[sums + 7] += gF * scratch[at + 1];
        limbSums[0] += gF * scratch[at + 2];
        limbSums[1] += gF * scratch[at + 3];
      }
  }
  const scratchE = new Float64Array(Math.max(nT, 1) * 3);

  return {
    evaluate(phi, grad) {
      grad.fill(0);
      let total = rvPart(phi, grad);
      for (let s = 0; s < lcs.length && nT > 0; s++) total += lcPart(phi, grad, s);
      return Number.isFinite(total) ? total : -Infinity;
    },
  };
}

/** Adds ∂/∂(h, k) from ∂/∂e and ∂/∂ω: e = h² + k², ω = atan2(k, h); at e = 0 only the e-part (zero). */
function addEccentricityGradient(phi: Float64Array, grad: Float64Array, slot: number, e: number, ge: number, gw: number): void {
  const h = phi[slot];
  const k = phi[slot + 1];
  const wOverE = e > 0 ? gw / e : 0;
  grad[slot] += 2 * h * ge - k * wOverE;
  grad[slot + 1] += 2 * k * ge + h * wOverE;
}

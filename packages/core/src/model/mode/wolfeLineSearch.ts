/**
 * Line search for the strong Wolfe conditions (Nocedal & Wright 2006, Numerical
 * Optimization, 2nd ed., Algorithms 3.5 and 3.6, with the cubic interpolation of
 * their eq. 3.59 safeguarded by bisection). Minimises φ(α) = f(x + α p).
 */

/** One evaluation of φ: value and slope φ'(α) = ∇f(x + αp)·p. */
export interface LineValue {
  readonly value: number;
  readonly slope: number;
}

export interface LineSearchResult {
  /** Accepted step, or 0 when the search failed. */
  readonly step: number;
  readonly ok: boolean;
  /** Number of φ evaluations made. */
  readonly evaluations: number;
}

export interface LineSearchSettings {
  /** Sufficient-decrease constant c₁ (default 1e-4). */
  readonly c1: number;
  /** Curvature constant c₂ (default 0.9, the usual choice for quasi-Newton methods). */
  readonly c2: number;
  /** Largest step tried. */
  readonly maxStep: number;
  /** Evaluation budget. */
  readonly maxEvaluations: number;
}

/** Minimiser of the cubic through (a, fa, da) and (b, fb, db), or NaN (N&W eq. 3.59). */
function cubicMinimiser(a: number, fa: number, da: number, b: number, fb: number, db: number): number {
  const d1 = da + db - (3 * (fa - fb)) / (a - b);
  const disc = d1 * d1 - da * db;
  if (!(disc >= 0)) return NaN;
  const d2 = Math.sign(b - a) * Math.sqrt(disc);
  return b - ((b - a) * (db + d2 - d1)) / (db - da + 2 * d2);
}

/**
 * Finds α > 0 with φ(α) ≤ φ(0) + c₁ α φ'(0) and |φ'(α)| ≤ c₂ |φ'(0)|. `phi` must leave
 * the evaluated point's state (position, gradient) in place for the accepted α: the
 * caller re-evaluates only when the last evaluation was not the accepted one, which
 * `lastEvaluated` tells. Non-finite values count as too large (the step is shrunk).
 */
export function strongWolfeLineSearch(
  phi: (alpha: number) => LineValue,
  phi0: LineValue,
  initialStep: number,
  settings: LineSearchSettings,
): LineSearchResult & { lastEvaluated: number } {
  const { c1, c2, maxStep, maxEvaluations } = settings;
  const f0 = phi0.value;
  const g0 = phi0.slope;
  let evaluations = 0;
  let last = NaN;
  const evaluate = (alpha: number): LineValue => {
    evaluations++;
    last = alpha;
    return phi(alpha);
  };
  const tooHigh = (alpha: number, v: LineValue): boolean =>
    !Number.isFinite(v.value) || !Number.isFinite(v.slope) || v.value > f0 + c1 * alpha * g0;

  const zoom = (lo: number, loV: LineValue, hi: number, hiV: LineValue): LineSearchResult => {
    while (evaluations < maxEvaluations) {
      let alpha = Number.isFinite(hiV.value) && Number.isFinite(hiV.slope)
        ? cubicMinimiser(lo, loV.value, loV.slope, hi, hiV.value, hiV.slope)
        : NaN;
      const left = Math.min(lo, hi);
      const right = Math.max(lo, hi);
      const margin = 0.1 * (right - left);
      if (!(alpha > left + margin && alpha < right - margin)) alpha = 0.5 * (lo + hi);
      if (right - left <= 1e-16 * Math.max(1, right)) return { step: 0, ok: false, evaluations };
      const v = evaluate(alpha);
      if (tooHigh(alpha, v) || v.value >= loV.value) {
        hi = alpha;
        hiV = v;
      } else {
        if (Math.abs(v.slope) <= -c2 * g0) return { step: alpha, ok: true, evaluations };
        if (v.slope * (hi - lo) >= 0) {
          hi = lo;
          hiV = loV;
        }
        lo = alpha;
        loV = v;
      }
    }
    return { step: 0, ok: false, evaluations };
  };

  let prev = 0;
  let prevV = phi0;
  let alpha = Math.min(initialStep, maxStep);
  for (let i = 1; evaluations < maxEvaluations; i++) {
    const v = evaluate(alpha);
    if (tooHigh(alpha, v) || (i > 1 && v.value >= prevV.value)) {
      return { ...zoom(prev, prevV, alpha, v), lastEvaluated: last };
    }
    if (Math.abs(v.slope) <= -c2 * g0) return { step: alpha, ok: true, evaluations, lastEvaluated: last };
    if (v.slope >= 0) return { ...zoom(alpha, v, prev, prevV), lastEvaluated: last };
    if (alpha >= maxStep) return { step: alpha, ok: true, evaluations, lastEvaluated: last };
    prev = alpha;
    prevV = v;
    alpha = Math.min(2 * alpha, maxStep);
  }
  return { step: 0, ok: false, evaluations, lastEvaluated: last };
}

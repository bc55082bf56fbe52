/** Logistic sigmoid 1 / (1 + e^{−u}), without overflow for large |u|. */
export function logistic(u: number): number {
  if (u >= 0) return 1 / (1 + Math.exp(-u));
  const e = Math.exp(u);
  return e / (1 + e);
}

/** ln(1 + e^u), without overflow for large u. */
export function softplus(u: number): number {
  return u > 0 ? u + Math.log1p(Math.exp(-u)) : Math.log1p(Math.exp(u));
}

/** ln σ(u) = −softplus(−u). */
export function logLogistic(u: number): number {
  return -softplus(-u);
}

/**
 * Energy Bayesian fraction of missing information of one chain (Betancourt 2016,
 * arXiv:1604.00695, eq. 3.6 and its estimator in sec. 6.1):
 *   E-BFMI = Σ_{n≥1} (E_n − E_{n−1})² / Σ_n (E_n − Ē)².
 * Values below 0.3 suggest the momentum resampling explores the energy poorly
 * (threshold: common practice). Returns NaN for fewer than 3 draws or a constant energy.
 */
export function energyBfmi(energy: ArrayLike<number>): number {
  const n = energy.length;
  if (n < 3) return Number.NaN;
  let mean = 0;
  for (let i = 0; i < n; i++) mean += energy[i];
  mean /= n;
  let num = 0;
  let den = 0;
  for (let i = 0; i < n; i++) {
    const d = energy[i] - mean;
    den += d * d;
    if (i > 0) {
      const s = energy[i] - energy[i - 1];
      num += s * s;
    }
  }
  return den > 0 ? num / den : Number.NaN;
}

/** The E-BFMI level below which a chain is flagged (common practice). */
export const EBFMI_THRESHOLD = 0.3;

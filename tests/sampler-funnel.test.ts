import { describe, expect, it } from 'vitest';
import { runChains } from '@apsis/core';
import { column, meanWithMcse, varianceWithMcse } from '../packages/core/test/support/mcse.js';
import { centredFunnel, nonCentredFunnel } from '../packages/core/test/support/targets.js';

// Neal's funnel (Neal 2003, Annals of Statistics 31, 705, sec. 8): v ~ N(0, 3²),
// x_i | v ~ N(0, e^v), 9 of them. The centred form has a neck that a step size adapted
// to the mouth cannot enter, which shows up as divergent transitions; the non-centred
// form is a standard normal and has none (CHECKS.md, "Samplers").
describe("Neal's funnel", () => {
  it('centred: divergences are reported', async () => {
    const r = await runChains(centredFunnel(10), { seed: 401 });
    const counted = r.stats.reduce((s, st) => s + st.divergent.reduce((a, b) => a + b, 0), 0);
    expect(r.divergences.reduce((a, b) => a + b, 0)).toBe(counted);
    expect(counted).toBeGreaterThan(0);
  });

  it('non-centred: essentially no divergences (at most 0.1%), and v = 3ν has variance 9 within 4 MCSE', async () => {
    const r = await runChains(nonCentredFunnel(10), { seed: 402 });
    const total = r.divergences.reduce((a, b) => a + b, 0);
    expect(total).toBeLessThanOrEqual(4); // 4 chains × 1000 draws
    const v = r.draws.map((d) => column(d, 10, 0).map((nu) => 3 * nu));
    const m = meanWithMcse(v);
    const s = varianceWithMcse(v, 0);
    expect(Math.abs(m.mean)).toBeLessThan(4 * m.mcse);
    expect(Math.abs(s.variance - 9)).toBeLessThan(4 * s.mcse);
  });
});

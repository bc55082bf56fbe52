import { createRandomStream, runChains, type Target } from '@apsis/core';
import { createTransitModel, simulateLightCurve } from '../src/index.js';

const rng = createRandomStream('scratch-transit');
const times: number[] = [];
const P = 3.2, tc = 2459000.71;
for (let t = 2459000; t < 2459040; t += 10 / 1440) {
  let d = (t - tc) % P; if (d > P / 2) d -= P; if (d < -P / 2) d += P;
  if (Math.abs(d) < 0.3) times.push(t);
}
const sim = simulateLightCurve({ label: 'cam', times, errors: 5e-4, exposureTime: 10 / 1440, planets: [{ period: P, tc, radiusRatio: 0.1, impactParameter: 0.4 }], starDensity: 1.6, u1: 0.4, u2: 0.25 }, rng);
const model = await createTransitModel({ lightCurves: [sim.data], planets: [{ label: 'b', period: 3.2001, tc: 2459000.712 }] });
let bad = 0;
let maxLp = -Infinity;
const target: Target = {
  dim: model.dim,
  logDensityGrad(x, g) {
    const lp = model.logDensityGrad(x, g);
    if (lp > maxLp) maxLp = lp;
    let ok = Number.isFinite(lp);
    for (let i = 0; i < g.length; i++) if (!Number.isFinite(g[i])) ok = false;
    let gmax = 0; for (let i = 0; i < g.length; i++) gmax = Math.max(gmax, Math.abs(g[i]));
    if ((lp < 6907 - 800 || gmax > 3000) && bad < 12) ok = false;
    if (!ok && bad < 12) {
      bad++;
      console.log('far', lp, Array.from(g).map((v) => v.toPrecision(3)).join(' '));
      console.log(Object.entries(model.valuesAt(x)).slice(0, 9).map(([k, v]) => `${k}=${v.toPrecision(8)}`).join(' '));
      console.log('x', Array.from(x).join(','));
    }
    return lp;
  },
};
const run = await runChains(target, { chains: 2, warmup: 500, draws: 300, seed: 5 });
console.log('div', run.divergences, 'bad', bad, 'maxLp', maxLp);

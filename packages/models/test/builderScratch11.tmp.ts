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
let sampling = false;
let shown = 0;
let prevX: Float64Array | null = null; let prevLp = 0;
const target: Target = {
  dim: model.dim,
  logDensityGrad(x, g) {
    const lp = model.logDensityGrad(x, g);
    if (sampling && lp < 6907 - 400 && shown < 8) {
      shown++;
      const v = model.valuesAt(x);
      console.log('lp', lp.toFixed(1), 'prev', prevLp.toFixed(1), Object.entries(v).slice(0, 9).map(([k, y]) => `${k}=${y.toPrecision(6)}`).join(' '));
      if (prevX) { const pv = model.valuesAt(prevX); console.log('   prev', Object.entries(pv).slice(0, 9).map(([k, y]) => `${k}=${y.toPrecision(6)}`).join(' ')); }
    }
    prevX = Float64Array.from(x); prevLp = lp;
    return lp;
  },
};
const run = await runChains(target, { chains: 2, warmup: 500, draws: 300, seed: 11, onProgress: (p) => { if (p.phase === 'sampling') sampling = true; } });
console.log('div', run.divergences);

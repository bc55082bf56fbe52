import { createRandomStream, runChains } from '@apsis/core';
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
const run = await runChains(model, { chains: 1, warmup: 400, draws: 100, seed: 3 });
const ad = run.adaptation[0];
const eps = ad.stepSize;
const invM = (ad.metric as { inverseMass: Float64Array }).inverseMass;
console.log('eps', eps, 'div', run.divergences);
const d = model.dim;
const g = new Float64Array(d);
let found = 0;
for (let trial = 0; trial < 100 && found < 6; trial++) {
  const start = run.draws[0].slice((trial % 100) * d, (trial % 100 + 1) * d);
  const x = Float64Array.from(start);
  const p = new Float64Array(d);
  for (let i = 0; i < d; i++) p[i] = rng.normal() / Math.sqrt(invM[i]);
  let lp = model.logDensityGrad(x, g);
  const H0 = -lp + 0.5 * p.reduce((s, v, i) => s + v * v * invM[i], 0);
  for (let step = 0; step < 300; step++) {
    for (let i = 0; i < d; i++) p[i] += 0.5 * eps * g[i];
    for (let i = 0; i < d; i++) x[i] += eps * invM[i] * p[i];
    lp = model.logDensityGrad(x, g);
    for (let i = 0; i < d; i++) p[i] += 0.5 * eps * g[i];
    const H = -lp + 0.5 * p.reduce((s, v, i) => s + v * v * invM[i], 0);
    if (!Number.isFinite(H) || H - H0 > 100) {
      found++;
      console.log('trial', trial, 'step', step, 'dH', H - H0, 'lp', lp);
      console.log(Object.entries(model.valuesAt(x)).slice(0, 9).map(([k, v]) => `${k}=${v.toPrecision(6)}`).join(' '));
      console.log('x', Array.from(x).map((v) => v.toFixed(2)).join(' '));
      break;
    }
  }
}

import { createRandomStream } from '@apsis/core';
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
const d = model.dim;
const g = new Float64Array(d);
for (let trial = 0; trial < 5; trial++) {
  const x = new Float64Array(d);
  for (let i = 0; i < d; i++) x[i] = rng.normal();
  const lp = model.logDensityGrad(x, g);
  const gx = Float64Array.from(g);
  const num = new Float64Array(d);
  for (let i = 0; i < d; i++) {
    const h = 1e-5;
    const xp = Float64Array.from(x); xp[i] += h;
    const xm = Float64Array.from(x); xm[i] -= h;
    num[i] = (model.logDensityGrad(xp, g) - model.logDensityGrad(xm, g)) / (2 * h);
  }
  console.log('lp', lp.toFixed(3), Array.from(gx).map((v, i) => `${model.names[i]}:${v.toPrecision(6)}/${num[i].toPrecision(6)}`).join(' '));
}
// line scan: second differences
const x0 = new Float64Array(d);
const dir = new Float64Array(d); for (let i = 0; i < d; i++) dir[i] = rng.normal();
let prev: number[] = [];
let maxJump = 0, where = 0;
const vals: number[] = [];
const n = 4001;
for (let s = 0; s < n; s++) {
  const t = -3 + 6 * s / (n - 1);
  const x = x0.map((v, i) => v + t * dir[i]);
  vals.push(model.logDensityGrad(Float64Array.from(x), g));
}
for (let s = 1; s < n - 1; s++) {
  const second = vals[s + 1] - 2 * vals[s] + vals[s - 1];
  if (Math.abs(second) > maxJump) { maxJump = Math.abs(second); where = s; }
}
console.log('max |second diff|', maxJump, 'at', where, vals.slice(where - 3, where + 4));
const med = vals.slice(1, -1).map((_, s) => Math.abs(vals[s + 2] - 2 * vals[s + 1] + vals[s])).sort((a, b) => a - b)[Math.floor(n / 2)];
console.log('median |second diff|', med);

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
for (let k = 0; k < d; k++) {
  // scan each axis finely over [-6, 6]
  const vals: number[] = [];
  const n = 12001;
  for (let s = 0; s < n; s++) {
    const x = new Float64Array(d); x[k] = -6 + 12 * s / (n - 1);
    vals.push(model.logDensityGrad(x, g));
  }
  let worst = 0, at = 0;
  for (let s = 2; s < n - 2; s++) {
    const a = Math.abs(vals[s + 1] - 2 * vals[s] + vals[s - 1]);
    const b = Math.abs(vals[s + 2] - 2 * vals[s+1] + vals[s]) + Math.abs(vals[s] - 2 * vals[s - 1] + vals[s - 2]);
    if (!Number.isFinite(a) || a > 20 * b + 1e-9) { if (!Number.isFinite(a) || a > worst) { worst = a; at = s; } }
  }
  console.log(model.names[k], 'lp range', Math.min(...vals).toFixed(1), Math.max(...vals).toFixed(1), 'suspicious', worst, at ? (-6 + 12 * at / (n - 1)).toFixed(4) : '');
}

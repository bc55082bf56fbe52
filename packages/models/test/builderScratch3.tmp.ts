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
const run = await runChains(model, { chains: 2, warmup: 600, draws: 300, seed: 3, maxTreeDepth: 8 });
console.log('div', run.divergences, run.adaptation.map((a) => a.stepSize));
const names = run.outputs!.names;
const nO = names.length;
for (let c = 0; c < 2; c++) {
  const st = run.stats[c];
  for (let i = 0; i < 300; i++) if (st.divergent[i]) {
    const row = run.outputs!.values[c].subarray(i * nO, (i + 1) * nO);
    console.log('div draw', c, i, names.slice(0, 9).map((n, k) => `${n}=${row[k].toPrecision(5)}`).join(' '), 'depth', st.treeDepth[i]);
  }
}
console.log(run.adaptation[0].metric);

import { createRandomStream, runChains } from '@apsis/core';
import { splitRhat } from '@apsis/diagnostics';
import { createTransitModel, simulateLightCurve } from '../src/index.js';

const rng = createRandomStream('scratch-transit');
const times: number[] = [];
// 40 days at 10-minute cadence, keep +-0.3 d windows of the transits only
const P = 3.2, tc = 2459000.71;
for (let t = 2459000; t < 2459040; t += 10 / 1440) {
  let d = (t - tc) % P; if (d > P / 2) d -= P; if (d < -P / 2) d += P;
  if (Math.abs(d) < 0.3) times.push(t);
}
const sim = simulateLightCurve({ label: 'cam', times, errors: 5e-4, exposureTime: 10 / 1440, planets: [{ period: P, tc, radiusRatio: 0.1, impactParameter: 0.4 }], starDensity: 1.6, u1: 0.4, u2: 0.25 }, rng);
let t0 = performance.now();
const model = await createTransitModel({ lightCurves: [sim.data], planets: [{ label: 'b', period: 3.2001, tc: 2459000.712 }] });
console.log('N', times.length, 'build ms', performance.now() - t0, 'dim', model.dim);
for (const p of model.parameters) console.log(p.names.join(','), p.centre.map((x) => x.toPrecision(6)).join(','), '|', p.prior);
t0 = performance.now();
const run = await runChains(model, { chains: 4, warmup: 300, draws: 300, seed: 3 });
console.log('sample s', (performance.now() - t0) / 1000, 'div', run.divergences, 'epoch', model.epoch);
const names = run.outputs!.names;
const D = 300;
for (const [c, name] of names.entries()) {
  const chains = run.outputs!.values.map((v) => { const a = new Float64Array(D); for (let i = 0; i < D; i++) a[i] = v[i * names.length + c]; return a; });
  const all = Array.from(chains.flatMap((a) => Array.from(a))).sort((a, b) => a - b);
  console.log(name.padEnd(24), all[Math.floor(all.length * 0.005)].toPrecision(7), all[Math.floor(all.length * 0.5)].toPrecision(7), all[Math.floor(all.length * 0.995)].toPrecision(7), 'rhat', splitRhat(chains).toFixed(4));
}
console.log('mean depth', run.stats.map((s) => Array.from(s.treeDepth).reduce((a, b) => a + b, 0) / s.treeDepth.length));
const x = new Float64Array(model.dim), g = new Float64Array(model.dim);
let t = performance.now();
for (let i = 0; i < 2000; i++) model.logDensityGrad(x, g);
console.log('us/eval', (performance.now() - t) / 2000 * 1000);

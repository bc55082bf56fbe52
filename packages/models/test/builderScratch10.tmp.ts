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
const run = await runChains(model, { chains: 2, warmup: 500, draws: 1000, seed: 5, targetAcceptance: 0.95 });
const names = run.outputs!.names; const nO = names.length;
const col = (n: string) => run.outputs!.values.flatMap((v) => { const out: number[] = []; for (let i = 0; i < 1000; i++) out.push(v[i * nO + names.indexOf(n)]); return out; });
const b = col('impactParameter_b'), rho = col('starDensity'), ubeta: number[] = [];
const hist = new Array(24).fill(0); for (const x of b) hist[Math.min(23, Math.floor(x / 0.03))]++;
console.log('b hist (0.03 bins)', hist.join(' '));
for (let k = 0; k < 24; k++) { const sel = rho.filter((_, i) => Math.floor(b[i] / 0.03) === k); if (sel.length) console.log((k * 0.03).toFixed(2), 'rho mean', (sel.reduce((a, c) => a + c, 0) / sel.length).toFixed(3)); }
const xs = run.draws.flatMap((v) => { const out: number[] = []; for (let i = 0; i < 1000; i++) out.push(v[i * model.dim + 3]); return out; }).sort((a, c) => a - c);
console.log('u_beta quantiles', [0.001, 0.01, 0.1, 0.5, 0.9, 0.99, 0.999].map((q) => xs[Math.floor(q * xs.length)].toFixed(2)).join(' '));
console.log('div', run.divergences, 'depth', run.stats.map((s) => (Array.from(s.treeDepth).reduce((a, c) => a + c, 0) / s.treeDepth.length).toFixed(2)));

import { createRandomStream, runChains } from '@apsis/core';
import { createTransitModel, simulateLightCurve } from '../src/index.js';

const configs: [string, boolean, Record<string, number>][] = [
  ['no exposure', false, {}],
  ['fixed q', true, { q1_cam: 0.4225, q2_cam: 0.3077 }],
  ['fixed jitter', true, { fluxJitter_cam: 0.00001 }],
  ['fixed b', true, { impactParameter_b: 0.4 }],
];
for (const [name, exposure, fixed] of configs) {
  const rng = createRandomStream('scratch-transit');
  const times: number[] = [];
  const P = 3.2, tc = 2459000.71;
  for (let t = 2459000; t < 2459040; t += 10 / 1440) {
    let d = (t - tc) % P; if (d > P / 2) d -= P; if (d < -P / 2) d += P;
    if (Math.abs(d) < 0.3) times.push(t);
  }
  const sim = simulateLightCurve({ label: 'cam', times, errors: 5e-4, ...(exposure ? { exposureTime: 10 / 1440 } : {}), planets: [{ period: P, tc, radiusRatio: 0.1, impactParameter: 0.4 }], starDensity: 1.6, u1: 0.4, u2: 0.25 }, rng);
  const model = await createTransitModel({ lightCurves: [sim.data], planets: [{ label: 'b', period: 3.2001, tc: 2459000.712 }], fixed });
  const t0 = performance.now();
  const run = await runChains(model, { chains: 2, warmup: 500, draws: 300, seed: 5 });
  console.log(name, 'div', run.divergences, 'eps', run.adaptation.map((a) => a.stepSize.toFixed(4)), 'depth', run.stats.map((s) => (Array.from(s.treeDepth).reduce((a, b) => a + b, 0) / s.treeDepth.length).toFixed(2)), 's', ((performance.now() - t0) / 1000).toFixed(1));
}

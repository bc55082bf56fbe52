import { createRandomStream, runChains } from '@apsis/core';
import { splitRhat } from '@apsis/diagnostics';
import { createRvModel, simulateRadialVelocities } from '../src/index.js';

const rng = createRandomStream('scratch');
const n = 60;
const times: number[] = [];
const inst: string[] = [];
for (let i = 0; i < n; i++) {
  times.push(2459000 + 600 * rng.uniform());
  inst.push(i % 3 === 0 ? 'west' : 'east');
}
const truth = [
  { period: 4.23, tc: 2459001.3, eccentricity: 0.1, omega: 40, semiAmplitude: 25 },
  { period: 37.5, tc: 2459010.0, eccentricity: 0.3, omega: -70, semiAmplitude: 12 },
];
const sim = simulateRadialVelocities({ times, instrument: inst, errors: 2, planets: truth, offsets: { east: -10, west: 25 }, jitters: { east: 1.5, west: 3 } }, rng);
let t0 = performance.now();
const model = await createRvModel({
  rv: sim.data,
  planets: [{ label: 'b', period: 4.23 }, { label: 'c', period: 37.5 }],
  star: { mass: 1, massUncertainty: 0.05 },
});
console.log('build ms', performance.now() - t0, 'dim', model.dim, model.names);
for (const p of model.parameters) console.log(p.names.join(','), p.centre.map((x) => x.toPrecision(6)).join(','), '|', p.prior);
console.log(model.valuesAt(new Float64Array(model.dim)));
t0 = performance.now();
const run = await runChains(model, { chains: 4, warmup: 400, draws: 400, seed: 3 });
console.log('sample s', (performance.now() - t0) / 1000, 'div', run.divergences);
const names = run.outputs!.names;
for (const [c, name] of names.entries()) {
  const chains = run.outputs!.values.map((v) => { const a = new Float64Array(400); for (let i = 0; i < 400; i++) a[i] = v[i * names.length + c]; return a; });
  const all = Array.from(chains.flatMap((a) => Array.from(a))).sort((a, b) => a - b);
  console.log(name.padEnd(24), all[Math.floor(all.length * 0.005)].toPrecision(6), all[Math.floor(all.length * 0.5)].toPrecision(6), all[Math.floor(all.length * 0.995)].toPrecision(6), 'rhat', splitRhat(chains).toFixed(4));
}
const depth = run.stats.map((s) => Array.from(s.treeDepth).reduce((a, b) => a + b, 0) / s.treeDepth.length);
console.log('mean depth', depth, 'steps', run.stats.map((s) => s.stepSize[0]));
{
  const x = new Float64Array(model.dim);
  const g = new Float64Array(model.dim);
  for (let i = 0; i < 2000; i++) model.logDensityGrad(x, g);
  let t = performance.now();
  for (let i = 0; i < 20000; i++) model.logDensityGrad(x, g);
  console.log('model us/eval', ((performance.now() - t) / 20000) * 1000);
  const lik = model.structure.likelihood;
  const phi = model.physicalAt(x);
  const gp = new Float64Array(phi.length);
  t = performance.now();
  for (let i = 0; i < 20000; i++) lik.evaluate(phi, gp);
  console.log('system lik us/eval', ((performance.now() - t) / 20000) * 1000);
  const out = new Float64Array(model.outputs.names.length);
  t = performance.now();
  for (let i = 0; i < 20000; i++) model.outputs.write(x, out);
  console.log('outputs us/draw', ((performance.now() - t) / 20000) * 1000);
  const steps = run.stats.reduce((s, c) => s + Array.from(c.leapfrogSteps).reduce((a, b) => a + b, 0), 0);
  console.log('leapfrog steps in draws', steps);
}

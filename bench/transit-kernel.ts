/**
 * Cost of the float64 transit kernels of `@apsis/models` at N = 2e4 points, one planet:
 * - `flux`: the light curve alone (`LightCurveKernel.flux`), ns per point;
 * - `flux+vjp`: the fused vector-Jacobian product, which also forms the light curve
 *   (`LightCurveKernel.vjp`), ns per point;
 * - `loglik+grad`: the Gaussian log-likelihood with baseline and jitter, value and
 *   gradient (`LightCurveLikelihood.logLikelihoodGrad`), ns per point;
 * for a light curve with a few percent of points in transit and one with every point in
 * transit, without supersampling and with 7 sub-samples per 30-minute exposure. Also
 * the cost of one occultation evaluation (`quadraticFluxUnchecked`,
 * `quadraticFluxPartialsUnchecked`) in ns per call.
 *
 * Run: npx tsx --conditions=source bench/transit-kernel.ts [--quick]
 * Figures are the best of 7 runs of at least 0.05 s of process CPU time (0.02 s with
 * --quick): CPU time, because the machine is shared.
 */
import {
  createLightCurveKernel,
  createLightCurveLikelihood,
  quadraticFluxPartialsUnchecked,
  quadraticFluxUnchecked,
} from '@apsis/models';

function cpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

const RUNS = 7;
function secondsPerCall(fn: () => void, minSeconds: number): number {
  let best = Infinity;
  for (let run = 0; run < RUNS; run++) {
    let calls = 0;
    const start = cpuSeconds();
    let elapsed = 0;
    do {
      fn();
      calls++;
      elapsed = cpuSeconds() - start;
    } while (elapsed < minSeconds);
    best = Math.min(best, elapsed / calls);
  }
  return best;
}

const quick = process.argv.includes('--quick');
const minSeconds = quick ? 0.02 : 0.05;
const N = 20000;
// Invented planet: P = 3.2 d, a/R_* = 9.5, b = 0.3, k = 0.1, mildly eccentric;
// T14 ≈ 2.5 h, so about 3% of a 2-minute-cadence light curve is in transit.
const params = Float64Array.from([3.2, 0.41, 0.05, 1.2, 9.5, 0.3, 0.1, 0.42, 0.21]);
const sparseTimes = Float64Array.from({ length: N }, (_, i) => -14 + i / 720);
const denseTimes = Float64Array.from({ length: N }, (_, i) => 0.41 + (i / (N - 1) - 0.5) * 0.09);

let sink = 0;
const rows: string[] = [];
for (const [label, times] of [
  ['few % in transit', sparseTimes],
  ['all in transit', denseTimes],
] as const) {
  for (const sub of [1, 7]) {
    const exposure = sub === 1 ? 0 : 30 / 1440;
    const kernel = createLightCurveKernel({ times, planets: 1, exposureTime: exposure, subSamples: sub });
    const F = kernel.flux(params);
    let inTransit = 0;
    for (let i = 0; i < N; i++) if (F[i] < 1) inTransit++;
    const weights = Float64Array.from(times, (_, i) => Math.sin(i));
    const grad = new Float64Array(kernel.parameterCount);
    const y = Float64Array.from(F, (f, i) => f + 1e-4 * Math.sin(3 * i));
    const like = createLightCurveLikelihood({ times, flux: y, errors: new Float64Array(N).fill(1e-4), planets: 1, exposureTime: exposure, subSamples: sub });
    const full = Float64Array.from([...params, 1, 5e-5]);
    const lgrad = new Float64Array(like.dim);
    const tFlux = secondsPerCall(() => {
      sink += kernel.flux(params)[0];
    }, minSeconds);
    const tVjp = secondsPerCall(() => {
      sink += kernel.vjp(params, weights, grad)[0];
    }, minSeconds);
    const tLike = secondsPerCall(() => {
      sink += like.logLikelihoodGrad(full, lgrad);
    }, minSeconds);
    const ns = (t: number) => ((t * 1e9) / N).toFixed(1).padStart(8);
    rows.push(
      `${label.padEnd(18)} ${String(sub).padStart(4)} ${((100 * inTransit) / N).toFixed(1).padStart(6)}%  ${ns(tFlux)} ${ns(tVjp)} ${ns(tLike)}   ${(tVjp / tFlux).toFixed(2)}`,
    );
  }
}

console.log(`transit kernels, N = ${N}, 1 planet; ns per point (best of ${RUNS}, CPU time)`);
console.log('light curve        sub  in-tr.      flux flux+vjp loglik+g   vjp/flux');
for (const r of rows) console.log(r);

// One occultation evaluation, over a sweep of (z, k) covering all geometric cases.
const M = 4096;
const zs = Float64Array.from({ length: M }, (_, i) => (1.25 * i) / M);
const out = new Float64Array(5);
const tValue = secondsPerCall(() => {
  for (let i = 0; i < M; i++) sink += quadraticFluxUnchecked(zs[i], 0.12, 0.42, 0.21);
}, minSeconds);
const tPartials = secondsPerCall(() => {
  for (let i = 0; i < M; i++) sink += quadraticFluxPartialsUnchecked(zs[i], 0.12, 0.42, 0.21, out, 0);
}, minSeconds);
console.log(`occultation flux, z in [0, 1.25), k = 0.12: value ${((tValue * 1e9) / M).toFixed(1)} ns, value+4 partials ${((tPartials * 1e9) / M).toFixed(1)} ns per call`);
if (sink === 42) console.log('');

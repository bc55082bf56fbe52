/**
 * Cost of the float64 radial-velocity kernels of `@apsis/models`, in nanoseconds per
 * data point per planet, for N = 1e2 .. 1e5 points and 1 or 3 planets:
 * - `kepler`: the Kepler solve alone (with sin E, cos E), per point;
 * - `value`: the summed curve (`RvCurveKernel.value`);
 * - `value+vjp`: the fused vector-Jacobian product, which also forms the curve
 *   (`RvCurveKernel.vjp`);
 * - `loglik+grad`: the whole Gaussian log-likelihood with two instruments and a linear
 *   trend, value and gradient (`RvLikelihood.logLikelihoodGrad`), per point per planet;
 * and, at N = 1e3, the same log-likelihood called through its TensorFlow.js op inside
 * `tf.valueAndGrad` (pure-JS CPU backend), printed as a ratio to the direct call.
 *
 * Run: npx tsx --conditions=source bench/rv-kernel.ts [--quick]
 * Each figure is the best of 7 runs of at least 0.05 s of process CPU time (0.02 s with
 * --quick); CPU time, because the machine is shared.
 */
import * as tf from '@tensorflow/tfjs';
import { createRvCurveKernel, createRvLikelihood, createRvLikelihoodOp, solveKeplerInto } from '@apsis/models';
import { pathToFileURL } from 'node:url';

export interface RvKernelFigure {
  readonly points: number;
  readonly planets: number;
  /** ns per point per planet. */
  readonly kepler: number;
  readonly value: number;
  readonly valueAndVjp: number;
  readonly logLikelihoodGrad: number;
}

export interface RvKernelFigures {
  readonly rows: RvKernelFigure[];
  /** µs per call of the log-likelihood op inside tf.valueAndGrad, N = 1e3, 2 planets. */
  readonly opMicroseconds: number;
  /** µs per direct logLikelihoodGrad call, same data. */
  readonly directMicroseconds: number;
}

/** CPU seconds used by this process so far (user + system): not inflated by waiting for a core. */
function cpuSeconds(): number {
  const u = process.cpuUsage();
  return (u.user + u.system) / 1e6;
}

/**
 * Best-of-`RUNS` CPU seconds per call of `fn`, each run lasting at least `minSeconds`.
 * The machine is shared: CPU time rather than wall time, and the minimum over several
 * runs, keep other jobs' load out of the figures as far as possible.
 */
const RUNS = 7;
function timePerCall(fn: () => void, minSeconds: number): number {
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

/** Invented planets: a warm eccentric one, a hot circular-ish one, a long-period one. */
const PLANETS = [
  [23.4, 2.1, 0.35, 1.2, 18],
  [4.71, 0.3, 0.02, -0.7, 42],
  [412.5, -60, 0.6, 2.6, 9],
];

function dataSet(n: number) {
  const times = new Float64Array(n);
  const values = new Float64Array(n);
  const errors = new Float64Array(n);
  const instrument = new Int32Array(n);
  for (let i = 0; i < n; i++) {
    times[i] = -700 + (1400 * i) / n + 0.37 * Math.sin(13.1 * i);
    values[i] = 20 * Math.sin(0.7 * i);
    errors[i] = 1 + (i % 5) * 0.4;
    instrument[i] = i % 3 === 0 ? 1 : 0;
  }
  return { times, values, errors, instrument };
}

export function measureRvKernel(quick = false): RvKernelFigures {
  const minSeconds = quick ? 0.02 : 0.05;
  const rows: RvKernelFigure[] = [];
  let sink = 0;
  for (const n of [100, 1000, 10000, 100000]) {
    const d = dataSet(n);
    for (const planets of [1, 3]) {
      const params = Float64Array.from(PLANETS.slice(0, planets).flat());
      const kernel = createRvCurveKernel({ times: d.times, planets });
      const out = new Float64Array(n);
      const weights = Float64Array.from({ length: n }, (_, i) => Math.cos(i));
      const grad = new Float64Array(kernel.parameterCount);
      const lik = createRvLikelihood({ ...d, instruments: 2, planets, trendDegree: 1 });
      const full = Float64Array.from([...params, 0.5, -1, 1.2, 0.8, 0.002]);
      const lgrad = new Float64Array(lik.dim);
      const scratch = new Float64Array(3);
      const mean = new Float64Array(n);
      for (let i = 0; i < n; i++) mean[i] = (2 * Math.PI * d.times[i]) / 23.4 + 0.1;
      const perPointPlanet = 1e9 / (n * planets);
      const kepler =
        (timePerCall(() => {
          for (let i = 0; i < n; i++) {
            solveKeplerInto(mean[i], 0.35, scratch, 0);
            sink += scratch[1];
          }
        }, minSeconds) *
          1e9) /
        n;
      const value = timePerCall(() => kernel.value(params, out), minSeconds) * perPointPlanet;
      const valueAndVjp = timePerCall(() => kernel.vjp(params, weights, grad), minSeconds) * perPointPlanet;
      const logLikelihoodGrad = timePerCall(() => {
        sink += lik.logLikelihoodGrad(full, lgrad);
      }, minSeconds) * perPointPlanet;
      rows.push({ points: n, planets, kepler, value, valueAndVjp, logLikelihoodGrad });
    }
  }
  // The same log-likelihood through its TF.js op, N = 1e3, 2 planets.
  const d = dataSet(1000);
  const lik = createRvLikelihood({ ...d, instruments: 2, planets: 2, trendDegree: 1 });
  const full = Float64Array.from([...PLANETS.slice(0, 2).flat(), 0.5, -1, 1.2, 0.8, 0.002]);
  const lgrad = new Float64Array(lik.dim);
  const op = createRvLikelihoodOp(lik);
  const p = tf.tensor1d(Float32Array.from(full));
  const vg = tf.valueAndGrad((q: tf.Tensor) => op(q as tf.Tensor1D, full));
  const opSeconds = timePerCall(() => {
    tf.tidy(() => {
      sink += vg(p).grad.dataSync()[0];
    });
  }, minSeconds);
  const directSeconds = timePerCall(() => {
    sink += lik.logLikelihoodGrad(full, lgrad);
  }, minSeconds);
  p.dispose();
  if (sink === 42) console.log('');
  return { rows, opMicroseconds: opSeconds * 1e6, directMicroseconds: directSeconds * 1e6 };
}

function printFigures(f: RvKernelFigures): void {
  console.log(`RV kernels, CPU ns per data point per planet (float64, best of ${RUNS})`);
  console.log('     N  planets   kepler    value  value+vjp  loglik+grad  vjp/value');
  for (const r of f.rows) {
    console.log(
      `${String(r.points).padStart(6)}  ${String(r.planets).padStart(7)}  ${r.kepler.toFixed(1).padStart(7)}  ${r.value
        .toFixed(1)
        .padStart(7)}  ${r.valueAndVjp.toFixed(1).padStart(9)}  ${r.logLikelihoodGrad.toFixed(1).padStart(11)}  ${(r.valueAndVjp / r.value)
        .toFixed(2)
        .padStart(9)}`,
    );
  }
  console.log(
    `log-likelihood+gradient, N = 1000, 2 planets: TF.js op in valueAndGrad (cpu) ${f.opMicroseconds.toFixed(1)} us, ` +
      `direct ${f.directMicroseconds.toFixed(1)} us, ratio ${(f.opMicroseconds / f.directMicroseconds).toFixed(2)}`,
  );
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await tf.setBackend('cpu');
  printFigures(measureRvKernel(process.argv.includes('--quick')));
}

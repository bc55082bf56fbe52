/**
 * Modelling-layer benchmark, printed as ratios measured in one run.
 *
 * For two typical likelihoods at N = 1e3 and 1e4 data points,
 *   1. Gaussian linear regression   y ~ N(a + b x, s²),
 *   2. sinusoid with jitter         y ~ N(c + k sin(2π t / p + φ), σᵢ² + j²),
 * the time of one log-density-and-gradient call of
 *   - the model compiled with a TensorFlow.js likelihood, on each available backend,
 *   - the same model compiled with a fused float64 likelihood,
 * each divided by the time of a hand-written float64 `Target` of the same density
 * (priors and log-Jacobians written out in the same loop).
 *
 * Run: npx tsx --conditions=source bench/model-gradient.ts [--quick]
 */
import { pathToFileURL } from 'node:url';
import {
  compileModel,
  float64Likelihood,
  priors,
  supports,
  tensorLikelihood,
  type CompiledModel,
  type ModelSpec,
  type Target,
} from '@apsis/core';

export interface GradientFigure {
  readonly model: string;
  readonly n: number;
  /** Microseconds per call of the hand-written float64 target. */
  readonly handWrittenMicros: number;
  /** Compiled fused float64 model / hand-written. */
  readonly fusedRatio: number;
  /** Per TensorFlow.js backend: microseconds per call and ratio to hand-written. */
  readonly tensorflow: readonly { readonly backend: string; readonly micros: number; readonly ratio: number }[];
}

/**
 * Microseconds per call of f: warm-up (lets the JIT optimise), then the fastest of five
 * rounds, which is the least disturbed by other processes on a shared machine.
 */
function timePerCall(f: () => void, seconds: number): number {
  const warm = performance.now();
  while (performance.now() - warm < Math.max(50, seconds * 200)) for (let i = 0; i < 10; i++) f();
  let best = Infinity;
  for (let round = 0; round < 5; round++) {
    let calls = 0;
    const start = performance.now();
    let elapsed = 0;
    while (elapsed < (seconds * 1000) / 5 || calls < 10) {
      for (let i = 0; i < 10; i++) f();
      calls += 10;
      elapsed = performance.now() - start;
    }
    best = Math.min(best, (elapsed * 1000) / calls);
  }
  return best;
}

function invented(n: number): { x: Float64Array; y: Float64Array; t: Float64Array; v: Float64Array; e: Float64Array } {
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  const t = new Float64Array(n);
  const v = new Float64Array(n);
  const e = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = -2 + (4 * i) / n;
    y[i] = 0.5 + 1.3 * x[i] + 0.3 * Math.sin(97.1 * i);
    t[i] = 100 * (i / n) + 0.1 * Math.sin(13 * i);
    e[i] = 1 + 0.2 * Math.cos(7 * i);
    v[i] = 2 + 5 * Math.sin((2 * Math.PI * t[i]) / 3.7 + 0.4) + e[i] * Math.sin(31.3 * i);
  }
  return { x, y, t, v, e };
}

interface Case {
  readonly label: string;
  readonly spec: (kind: 'tensorflow' | 'float64', data: ReturnType<typeof invented>) => ModelSpec;
  readonly handWritten: (data: ReturnType<typeof invented>) => Target;
  readonly position: Float64Array;
}

const regression: Case = {
  label: 'Gaussian linear regression',
  position: Float64Array.of(0.4, 1.2, Math.log(0.35)),
  spec: (kind, d) => ({
    parameters: [
      { name: 'a', prior: priors.normal(0, 10) },
      { name: 'b', prior: priors.normal(0, 10) },
      { name: 's', support: supports.positive(), prior: priors.halfNormal(2) },
    ],
    data: { x: d.x, y: d.y },
    likelihood:
      kind === 'tensorflow'
        ? tensorLikelihood((p, _e, { tf, data }) => {
            const r = tf.div(tf.sub(data.y, tf.add(p.a, tf.mul(p.b, data.x))), p.s);
            return tf.sub(tf.mul(-0.5, tf.sum(tf.square(r))), tf.mul(data.x.size, tf.log(p.s)));
          })
        : float64Likelihood((layout, data) => {
            const x = data.x as Float64Array;
            const y = data.y as Float64Array;
            const [ia, ib, is] = ['a', 'b', 's'].map((k) => layout.offset(k));
            return (th, g) => {
              const a = th[ia];
              const b = th[ib];
              const s = th[is];
              const inv = 1 / s;
              let ss = 0;
              let ga = 0;
              let gb = 0;
              for (let i = 0; i < x.length; i++) {
                const r = (y[i] - a - b * x[i]) * inv;
                ss += r * r;
                ga += r;
                gb += r * x[i];
              }
              g[ia] = ga * inv;
              g[ib] = gb * inv;
              g[is] = (ss - x.length) * inv;
              return -0.5 * ss - x.length * Math.log(s);
            };
          }),
  }),
  handWritten: (d) => {
    const { x, y } = d;
    const n = x.length;
    const c = -2 * Math.log(10 * Math.sqrt(2 * Math.PI)) + Math.log(2) - Math.log(2 * Math.sqrt(2 * Math.PI));
    return {
      dim: 3,
      logDensityGrad(u, g) {
        const a = u[0];
        const b = u[1];
        const s = Math.exp(u[2]);
        const inv = 1 / s;
        let ss = 0;
        let ga = 0;
        let gb = 0;
        for (let i = 0; i < n; i++) {
          const r = (y[i] - a - b * x[i]) * inv;
          ss += r * r;
          ga += r;
          gb += r * x[i];
        }
        // priors N(0, 10²) on a, b; half-normal(2) on s; log-Jacobian u₂.
        g[0] = ga * inv - a / 100;
        g[1] = gb * inv - b / 100;
        g[2] = (ss - n) - (s * s) / 4 + 1;
        return -0.5 * ss - n * u[2] - (a * a + b * b) / 200 - (s * s) / 8 + u[2] + c;
      },
    };
  },
};

const TWO_PI = 2 * Math.PI;
const sinusoid: Case = {
  label: 'sinusoid with jitter',
  position: Float64Array.of(2, Math.log(5), Math.log(3.7), 0.4, Math.log(0.5)),
  spec: (kind, d) => ({
    parameters: [
      { name: 'c', prior: priors.normal(0, 10) },
      { name: 'k', support: supports.positive(), prior: priors.halfNormal(20) },
      { name: 'p', support: supports.positive(), prior: priors.logNormal(1.3, 0.5) },
      { name: 'phi', prior: priors.normal(0, 3) },
      { name: 'j', support: supports.positive(), prior: priors.halfNormal(5) },
    ],
    data: { t: d.t, v: d.v, e: d.e },
    likelihood:
      kind === 'tensorflow'
        ? tensorLikelihood((p, _e, { tf, data }) => {
            const arg = tf.add(tf.mul(tf.div(TWO_PI, p.p), data.t), p.phi);
            const mu = tf.add(p.c, tf.mul(p.k, tf.sin(arg)));
            const variance = tf.add(tf.square(data.e), tf.square(p.j));
            const r2 = tf.div(tf.square(tf.sub(data.v, mu)), variance);
            return tf.mul(-0.5, tf.sum(tf.add(r2, tf.log(variance))));
          })
        : float64Likelihood((layout, data) => {
            const t = data.t as Float64Array;
            const v = data.v as Float64Array;
            const e = data.e as Float64Array;
            const [ic, ik, ip, iphi, ij] = ['c', 'k', 'p', 'phi', 'j'].map((k) => layout.offset(k));
            return (th, g) => sinusoidLogLik(t, v, e, th[ic], th[ik], th[ip], th[iphi], th[ij], g, ic, ik, ip, iphi, ij);
          }),
  }),
  handWritten: (d) => {
    const { t, v, e } = d;
    const g5 = new Float64Array(5);
    return {
      dim: 5,
      logDensityGrad(u, g) {
        const c = u[0];
        const k = Math.exp(u[1]);
        const p = Math.exp(u[2]);
        const phi = u[3];
        const j = Math.exp(u[4]);
        g5.fill(0);
        const ll = sinusoidLogLik(t, v, e, c, k, p, phi, j, g5, 0, 1, 2, 3, 4);
        // priors: N(0, 10²), half-normal(20), log-normal(1.3, 0.5), N(0, 3²), half-normal(5); Jacobians u₁, u₂, u₄.
        const lp = -(c * c) / 200 - (k * k) / 800 - Math.log(p) - (Math.log(p) - 1.3) ** 2 / 0.5 - (phi * phi) / 18 - (j * j) / 50;
        g[0] = g5[0] - c / 100;
        g[1] = (g5[1] - k / 400) * k + 1;
        g[2] = (g5[2] + (-1 - (Math.log(p) - 1.3) / 0.25) / p) * p + 1;
        g[3] = g5[3] - phi / 9;
        g[4] = (g5[4] - j / 25) * j + 1;
        return ll + lp + u[1] + u[2] + u[4];
      },
    };
  },
};

function sinusoidLogLik(
  t: Float64Array, v: Float64Array, e: Float64Array,
  c: number, k: number, p: number, phi: number, j: number,
  g: Float64Array, ic: number, ik: number, ip: number, iphi: number, ij: number,
): number {
  const w = TWO_PI / p;
  const j2 = j * j;
  let ll = 0;
  let gc = 0;
  let gk = 0;
  let gp = 0;
  let gphi = 0;
  let gj = 0;
  for (let i = 0; i < t.length; i++) {
    const arg = w * t[i] + phi;
    const s = Math.sin(arg);
    const variance = e[i] * e[i] + j2;
    const inv = 1 / variance;
    const r = v[i] - c - k * s;
    ll -= 0.5 * (r * r * inv + Math.log(variance));
    const q = r * inv;
    gc += q;
    gk += q * s;
    const dArg = q * k * Math.cos(arg);
    gphi += dArg;
    gp -= (dArg * w * t[i]) / p;
    gj += (q * q - inv) * j;
  }
  g[ic] = gc;
  g[ik] = gk;
  g[ip] = gp;
  g[iphi] = gphi;
  g[ij] = gj;
  return ll;
}

/** Measures every case, N and backend. */
export async function measureModelGradient(options: { quick?: boolean } = {}): Promise<GradientFigure[]> {
  const seconds = options.quick ? 0.15 : 0.6;
  const sizes = [1_000, 10_000];
  const backends = ['cpu', 'wasm'] as const;
  const figures: GradientFigure[] = [];
  for (const c of [regression, sinusoid]) {
    for (const n of sizes) {
      const d = invented(n);
      const hand = c.handWritten(d);
      const grad = new Float64Array(hand.dim);
      const fused = await compileModel(c.spec('float64', d));
      // Same density (up to constants): the gradients must agree.
      const gFused = new Float64Array(hand.dim);
      hand.logDensityGrad(c.position, grad);
      const a = fused.logDensityGrad(c.position, gFused);
      for (let i = 0; i < hand.dim; i++) {
        if (Math.abs(grad[i] - gFused[i]) > 1e-8 * Math.max(1, Math.abs(grad[i]))) {
          throw new Error(`${c.label}: gradient ${i}: hand-written ${grad[i]}, fused ${gFused[i]}`);
        }
      }
      const handMicros = timePerCall(() => hand.logDensityGrad(c.position, grad), seconds);
      const fusedMicros = timePerCall(() => fused.logDensityGrad(c.position, gFused), seconds);
      const tensorflow: GradientFigure['tensorflow'][number][] = [];
      for (const backend of backends) {
        const model: CompiledModel = await compileModel(c.spec('tensorflow', d), { backend, quiet: true });
        const g = new Float64Array(model.dim);
        const v = model.logDensityGrad(c.position, g);
        if (Math.abs(v - a) > 1e-4 * Math.abs(a)) throw new Error(`${c.label} on ${backend}: ${v} vs ${a}`);
        const micros = timePerCall(() => model.logDensityGrad(c.position, g), seconds);
        tensorflow.push({ backend, micros, ratio: micros / handMicros });
        model.dispose();
      }
      figures.push({ model: c.label, n, handWrittenMicros: handMicros, fusedRatio: fusedMicros / handMicros, tensorflow });
    }
  }
  return figures;
}

function format(figures: readonly GradientFigure[]): string {
  const lines = ['model                        N      hand-written µs  fused/hand  ' + 'cpu/hand  wasm/hand  (cpu µs, wasm µs)'];
  for (const f of figures) {
    const cpu = f.tensorflow.find((t) => t.backend === 'cpu')!;
    const wasm = f.tensorflow.find((t) => t.backend === 'wasm')!;
    lines.push(
      `${f.model.padEnd(28)} ${String(f.n).padEnd(6)} ${f.handWrittenMicros.toFixed(1).padStart(15)}  ${f.fusedRatio.toFixed(2).padStart(10)}  ` +
        `${cpu.ratio.toFixed(1).padStart(8)}  ${wasm.ratio.toFixed(1).padStart(9)}  (${cpu.micros.toFixed(0)}, ${wasm.micros.toFixed(0)})`,
    );
  }
  return lines.join('\n');
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const figures = await measureModelGradient({ quick: process.argv.includes('--quick') });
  console.log(format(figures));
}

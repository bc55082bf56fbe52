/**
 * Targets for bench/runner-parallel.ts, built by worker threads from recipes
 * ({ module: this file, exportName, args }). Both fit the same invented sinusoid data:
 * y_i = K sin(ω t_i + φ) + c + ε_i, ε_i ~ N(0, 1), with normal priors on (K, ω, φ, c).
 */
import { compileModel, createRandomStream, priors, tensorLikelihood, type Target } from '@apsis/core';
import type { Tensor } from '@tensorflow/tfjs';

interface SinusoidArgs {
  /** Number of data points. */
  n: number;
}

const truth = { K: 3, omega: 3, phi: 0.4, c: -1 };

/**
 * Invented data: times uniform on [−1, 1] (in units of the observing span, so that all
 * four parameters have posterior widths of the same order), unit noise, fixed seed.
 */
export function sinusoidData(n: number): { t: Float64Array; y: Float64Array } {
  const rng = createRandomStream('apsis runner bench data');
  const t = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    t[i] = 2 * rng.uniform() - 1;
    y[i] = truth.K * Math.sin(truth.omega * t[i] + truth.phi) + truth.c + rng.normal();
  }
  return { t, y };
}

/** Positions near the truth for `chains` chains (the posterior of ω has side modes far from it). */
export function sinusoidInit(chains: number): number[][] {
  return Array.from({ length: chains }, (_, c) => [truth.K + 0.1 * c, truth.omega, truth.phi - 0.01 * c, truth.c]);
}

/** A hand-fused float64 log-density and gradient over (K, ω, φ, c). */
export function fusedSinusoid(args: SinusoidArgs): Target {
  const { t, y } = sinusoidData(args.n);
  const n = args.n;
  return {
    dim: 4,
    names: ['K', 'omega', 'phi', 'c'],
    logDensityGrad(x, g) {
      const [K, w, p, c] = x;
      let lp = -0.5 * ((K / 10) ** 2 + ((w - 3) / 1) ** 2 + (p / 3) ** 2 + (c / 10) ** 2);
      let gK = -K / 100;
      let gw = -(w - 3);
      let gp = -p / 9;
      let gc = -c / 100;
      for (let i = 0; i < n; i++) {
        const a = w * t[i] + p;
        const s = Math.sin(a);
        const co = Math.cos(a);
        const r = y[i] - (K * s + c);
        lp -= 0.5 * r * r;
        gK += r * s;
        gw += r * K * co * t[i];
        gp += r * K * co;
        gc += r;
      }
      g[0] = gK;
      g[1] = gw;
      g[2] = gp;
      g[3] = gc;
      return lp;
    },
  };
}

/** The same model through the modelling layer, with the likelihood in TensorFlow.js ops. */
export async function tensorSinusoid(args: SinusoidArgs): Promise<Target> {
  const { t, y } = sinusoidData(args.n);
  return compileModel(
    {
      parameters: [
        { name: 'K', prior: priors.normal(0, 10) },
        { name: 'omega', prior: priors.normal(3, 1) },
        { name: 'phi', prior: priors.normal(0, 3) },
        { name: 'c', prior: priors.normal(0, 10) },
      ],
      data: { t, y },
      likelihood: tensorLikelihood((p, _exact, { tf, data }) => {
        const mu = tf.add(tf.mul(p.K, tf.sin(tf.add(tf.mul(p.omega, data.t), p.phi))), p.c) as Tensor;
        return tf.mul(-0.5, tf.sum(tf.square(tf.sub(data.y, mu))));
      }),
    },
    { quiet: true },
  );
}

/**
 * Robust linear regression: a straight line fitted to data with heavy-tailed
 * (Student-t) scatter, where a few points lie far from the line. The likelihood is
 * written with TensorFlow.js ops; apsis differentiates it, adds the priors and the
 * transform of the positive scale, and samples the posterior with NUTS.
 *
 *   npx tsx --conditions=source examples/robust-regression.ts
 *
 * The data are simulated (invented), so the true line is known and printed beside
 * the posterior summary.
 */
import { pathToFileURL } from 'node:url';
import { compileModel, createRandomStream, drawsByName, priors, runChains, supports, tensorLikelihood } from '@apsis/core';
import { summarize, type QuantitySummary } from '@apsis/diagnostics';

/** The line and scatter the data are simulated from. */
export const truth = { intercept: 2.5, slope: 0.8, scale: 0.5 } as const;

/** Degrees of freedom of the Student-t scatter, taken as known. */
const dof = 3;

/** n points with x uniform on [0, 10] and y = intercept + slope·x + scale·t₃ noise. */
export function simulate(n: number, seed: string): { x: Float64Array; y: Float64Array } {
  const stream = createRandomStream(seed);
  const noise = priors.studentT(dof, 0, truth.scale); // priors can also draw values
  const x = new Float64Array(n);
  const y = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    x[i] = 10 * stream.uniform();
    y[i] = truth.intercept + truth.slope * x[i] + noise.sample!(stream);
  }
  return { x, y };
}

export interface RobustRegressionOptions {
  readonly points?: number;
  readonly chains?: number;
  readonly warmup?: number;
  readonly draws?: number;
  readonly seed?: number;
  /** Print nothing (the summary and the backend note). */
  readonly quiet?: boolean;
}

export async function main(options: RobustRegressionOptions = {}): Promise<QuantitySummary[]> {
  const { points = 200, chains = 4, warmup = 500, draws = 1000, seed = 1, quiet = false } = options;
  const data = simulate(points, `robust regression data ${seed}`);

  const model = await compileModel(
    {
      parameters: [
        { name: 'intercept', prior: priors.normal(0, 10) },
        { name: 'slope', prior: priors.normal(0, 5) },
        { name: 'scale', support: supports.positive(), prior: priors.halfNormal(2) },
      ],
      data,
      // log L = Σᵢ [−(ν + 1)/2 · ln(1 + zᵢ²/ν) − ln scale] + constant, zᵢ = (yᵢ − μᵢ)/scale.
      likelihood: tensorLikelihood((p, _exact, { tf, data }) => {
        const mu = tf.add(p.intercept, tf.mul(p.slope, data.x));
        const z = tf.div(tf.sub(data.y, mu), p.scale);
        const perPoint = tf.sub(tf.mul(-(dof + 1) / 2, tf.log1p(tf.div(tf.square(z), dof))), tf.log(p.scale));
        return tf.sum(perPoint);
      }),
      // Recorded for every draw beside the parameters.
      derived: [{ name: 'lineAt10', compute: (v) => (v.intercept as number) + 10 * (v.slope as number) }],
    },
    { quiet },
  );

  const result = await runChains(model, { chains, warmup, draws, seed });
  model.dispose();

  // One array of chains per output column (intercept, slope, scale, lineAt10), summarised
  // with the central 99% interval as quantiles 0.5% and 99.5%.
  const summary = summarize(drawsByName(result), { quantiles: [0.005, 0.995] }).rows;
  if (!quiet) {
    const known: Record<string, number> = { ...truth, lineAt10: truth.intercept + 10 * truth.slope };
    console.log('quantity      truth     mean    99% interval');
    for (const { name, mean, quantiles: [low, high] } of summary) {
      console.log(`${name.padEnd(12)} ${known[name].toFixed(3).padStart(6)}  ${mean.toFixed(3).padStart(7)}    [${low.value.toFixed(3)}, ${high.value.toFixed(3)}]`);
    }
  }
  return summary;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  await main();
}

import type { Scalar, Tensor } from '@tensorflow/tfjs';
import type { TensorFlow } from '../tensorflow/loadTensorFlow.js';
import type { ResolvedParameter } from './declarations.js';
import { ModelDeclarationError } from './errors.js';
import type { ExactData, ExactValues, TensorContext, TensorLikelihood } from './spec.js';
import { strictRecord } from './strictRecord.js';

/** A compiled likelihood term over the constrained vector θ. */
export interface CompiledTerm {
  /** Adds ∂ log L/∂θ into gTheta and returns log L (float64 where known). */
  evaluate(theta: Float64Array, gTheta: Float64Array): number;
  /** Evaluates once with name checks on every record the user code reads. */
  trial(theta: Float64Array, gTheta: Float64Array): number;
}

/** Float32 tensors of the data, created once and owned by the model. */
export function dataTensors(tf: TensorFlow, exactData: ExactData): Record<string, Tensor> {
  const out: Record<string, Tensor> = {};
  for (const [k, v] of Object.entries(exactData)) {
    out[k] = typeof v === 'number' ? tf.scalar(v) : tf.tensor1d(Float32Array.from(v));
  }
  return out;
}

/**
 * Compiles a TensorFlow.js likelihood. Each call, inside one `tf.tidy`: one float32
 * tensor per parameter, the user's function on the tape, reverse mode through the
 * engine's `gradients` (what `tf.valueAndGrads` runs, here allowing parameters the
 * likelihood does not touch, whose gradient is zero), then the float32 gradients are
 * added to the float64 gradient. The value is summed in float64: exact terms with
 * their float64 values, the other terms with their float32 values.
 */
export function compileTensorTerm(
  tf: TensorFlow,
  params: readonly ResolvedParameter[],
  likelihood: TensorLikelihood,
  exactValues: ExactValues,
  exactData: ExactData,
  data: Record<string, Tensor>,
  warn: (message: string) => void,
): CompiledTerm {
  const parts = new Map<Tensor, number>();
  const paramRecord: Record<string, Tensor> = {};
  let warned = false;
  let restValue = 0;
  let exactSum = 0;

  const recordExact = (term: Scalar, value: number): void => {
    parts.set(term, value);
  };

  const exactTerm: TensorContext['exactTerm'] = (inputs, evaluate) => {
    const gradients = inputs.map((t) => new Float64Array(t.size));
    let value = NaN;
    const op = tf.customGrad((...args: unknown[]) => {
      void args;
      value = evaluate(gradients);
      return {
        value: tf.scalar(value),
        gradFunc: (dy: Tensor) =>
          gradients.map((g, i) => tf.mul(dy, tf.tensor(Float32Array.from(g), inputs[i].shape))),
      };
    }) as unknown as (...xs: Tensor[]) => Scalar;
    const out = op(...inputs);
    parts.set(out, value);
    return out;
  };

  const context: TensorContext = { tf, data, exactData, exactTerm, recordExact };

  const isScalar = (t: unknown): t is Scalar => t instanceof tf.Tensor && t.rank === 0;

  const run = (
    xs: Tensor[],
    record: Record<string, Tensor>,
    exact: ExactValues,
    ctx: TensorContext,
  ): Scalar => {
    for (let i = 0; i < params.length; i++) paramRecord[params[i].name] = xs[i];
    const out = likelihood.logLikelihood(record, exact, ctx);
    const terms: readonly Tensor[] = Array.isArray(out) ? out : [out as Tensor];
    if (terms.length === 0) {
      throw new ModelDeclarationError('likelihood', out, 'a scalar tensor or a non-empty array of scalar tensors');
    }
    exactSum = 0;
    let used = 0;
    const rest: Scalar[] = [];
    for (let i = 0; i < terms.length; i++) {
      const t = terms[i];
      if (!isScalar(t)) {
        throw new ModelDeclarationError(Array.isArray(out) ? `likelihood term ${i}` : 'likelihood', t, 'a scalar (rank 0) tensor');
      }
      const v = parts.get(t);
      if (v !== undefined) {
        exactSum += v;
        used++;
      } else {
        rest.push(t);
      }
    }
    if (used < parts.size && !warned) {
      warned = true;
      warn(
        'apsis: a TensorFlow.js likelihood made exact float64 terms but combined them with tensor ops before returning; ' +
          'their float32 values were used. Return them as separate terms (an array) to keep float64 values.',
      );
    }
    const restTensor = rest.length === 0 ? null : rest.length === 1 ? rest[0] : (tf.addN(rest) as Scalar);
    restValue = restTensor === null ? 0 : restTensor.dataSync()[0];
    return (terms.length === 1 ? terms[0] : tf.addN(terms as Tensor[])) as Scalar;
  };

  const once = (theta: Float64Array, gTheta: Float64Array, strict: boolean): number => {
    parts.clear();
    const value = tf.tidy(() => {
      const xs: Tensor[] = new Array(params.length);
      for (let i = 0; i < params.length; i++) {
        const p = params[i];
        xs[i] = p.scalar ? tf.scalar(theta[p.at]) : tf.tensor1d(Float32Array.from(theta.subarray(p.at, p.at + p.size)));
      }
      const record = strict ? strictRecord(paramRecord, 'params') : paramRecord;
      const exact = strict ? strictRecord(exactValues, 'exact') : exactValues;
      const ctx = strict
        ? { ...context, data: strictRecord(data, 'context.data'), exactData: strictRecord(exactData, 'context.exactData') }
        : context;
      const { grads } = tf.engine().gradients(() => run(xs, record, exact, ctx), xs, undefined, true);
      for (let i = 0; i < params.length; i++) {
        const g = grads[i];
        if (g === undefined || g === null) continue;
        const p = params[i];
        const d = g.dataSync();
        for (let j = 0; j < p.size; j++) gTheta[p.at + j] += d[j];
      }
      return exactSum + restValue;
    });
    parts.clear();
    return value;
  };

  return {
    evaluate: (theta, gTheta) => once(theta, gTheta, false),
    trial: (theta, gTheta) => {
      try {
        return once(theta, gTheta, true);
      } catch (e) {
        throw explainMissingKernel(e, tf.getBackend());
      }
    },
  };
}

/**
 * Turns TensorFlow.js's "kernel not registered" and "gradient function not found"
 * failures into an error that says what to do. Known gaps (DESIGN.md): on WASM the
 * gradient of `gather` needs `UnsortedSegmentSum`, which WASM lacks; `tf.where` on a
 * condition computed from a differentiated tensor has no gradient on any backend.
 */
export function explainMissingKernel(e: unknown, backend: string): unknown {
  if (!(e instanceof Error)) return e;
  const kernel = /Kernel '(\w+)' not registered for backend '(\w+)'/.exec(e.message);
  if (kernel) {
    const err = new ModelDeclarationError(
      'likelihood',
      `an op needing kernel ${kernel[1]}`,
      `ops that backend "${kernel[2]}" implements: use backend "cpu" (option backend: 'cpu' or APSIS_BACKEND=cpu), ` +
        'or replace the op (for gather: slice, unstack or a one-hot matMul)',
    );
    (err as Error & { cause?: unknown }).cause = e;
    return err;
  }
  const gradient = /gradient function not found for (\w+)/i.exec(e.message);
  if (gradient) {
    const err = new ModelDeclarationError(
      'likelihood',
      `an op whose gradient needs ${gradient[1]}`,
      `differentiable ops on backend "${backend}": build conditions (tf.where, comparisons) from values off the tape, ` +
        'e.g. from the exact float64 values or the data',
    );
    (err as Error & { cause?: unknown }).cause = e;
    return err;
  }
  return e;
}

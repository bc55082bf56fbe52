import type { Scalar, Tensor } from '@tensorflow/tfjs';
import type { TensorFlow } from '../tensorflow/loadTensorFlow.js';
import type { ParameterLayout } from './layout.js';
import type { Prior } from './priors/prior.js';
import type { Support } from './supports/transform.js';

/** One named parameter of a model. */
export interface ParameterDeclaration {
  /** Name: a letter or underscore, then letters, digits or underscores. */
  readonly name: string;
  /** Length of a vector parameter; omit for a scalar. Elements are named `name[0]` … (0-based). */
  readonly size?: number;
  /** Support and its bijection (default `supports.real()`). */
  readonly support?: Support;
  /**
   * Prior, applied to each element (scalar priors) or to the whole vector (Dirichlet).
   * Optional only where a proper default exists: uniform on an interval, circular
   * uniform for an angle, Dirichlet(1) on a simplex.
   */
  readonly prior?: Prior;
}

/** Float64 values of data fields as the likelihood sees them. */
export type ExactData = Readonly<Record<string, number | Float64Array>>;

/**
 * Constrained parameter values in float64: a number for a scalar parameter, a
 * `Float64Array` for a vector. The object and arrays are reused between calls: read
 * them during the call, copy them to keep them.
 */
export type ExactValues = Readonly<Record<string, number | Float64Array>>;

/** Accepted data field values: a number, or a column of numbers. */
export type DataValue = number | readonly number[] | Float64Array | Float32Array | Int32Array;

/** Data handed to a model. */
export type DataRecord = Readonly<Record<string, DataValue>>;

/**
 * A fused float64 log-likelihood: reads the constrained values `theta` (laid out as
 * described by the {@link ParameterLayout} given to the builder), writes
 * ∂ log L / ∂θ into `grad` (same layout; zero on entry, so writing or adding are both
 * fine) and returns log L. Must not keep references to `theta` or `grad`.
 */
export type Float64LogLikelihood = (theta: Float64Array, grad: Float64Array) => number;

/**
 * The per-call context a TensorFlow.js likelihood receives: the TensorFlow.js module,
 * the data as float32 tensors and as float64 values, and the exact-term registry.
 */
export interface TensorContext {
  /** The TensorFlow.js module in use (use it rather than importing your own copy). */
  readonly tf: TensorFlow;
  /** Data fields as float32 tensors (scalars or 1-D), owned by the model. */
  readonly data: Readonly<Record<string, Tensor>>;
  /** Data fields in float64. */
  readonly exactData: ExactData;
  /**
   * A scalar log-likelihood term computed in float64 by `evaluate`, which returns the
   * term's value and writes ∂term/∂inputᵢ (flattened like the input) into
   * `gradients[i]`. Gradients flow back to `inputs` through a `tf.customGrad` op. The
   * term's exact value replaces its float32 value in the log-density when the term is
   * returned from the likelihood as one of the summed terms (see docs/modelling.md).
   */
  exactTerm(inputs: readonly Tensor[], evaluate: (gradients: readonly Float64Array[]) => number): Scalar;
  /**
   * Registers `value` as the exact float64 value of the scalar tensor `term`, for op
   * authors who build their own `tf.customGrad` ops.
   */
  recordExact(term: Scalar, value: number): void;
}

/**
 * A log-likelihood written with TensorFlow.js ops. `params` holds one float32 tensor
 * per parameter (scalar, or 1-D of the parameter's length) on the gradient tape;
 * `exact` holds the same values in float64 (the side channel). Return one scalar
 * (rank-0) tensor, or an array of them to be summed: terms made by
 * `context.exactTerm` then enter the log-density with their float64 values. (Typed as
 * `Tensor` because TensorFlow.js ops are; the rank is checked at run time.)
 */
export type TensorLogLikelihood = (
  params: Readonly<Record<string, Tensor>>,
  exact: ExactValues,
  context: TensorContext,
) => Tensor | readonly Tensor[];

/** A likelihood written with TensorFlow.js ops (differentiated by its tape). */
export interface TensorLikelihood {
  readonly kind: 'tensorflow';
  readonly logLikelihood: TensorLogLikelihood;
}

/** A fused float64 likelihood, built once per compiled model. */
export interface Float64Likelihood {
  readonly kind: 'float64';
  /**
   * Called once at compile time with the parameter layout and the float64 data;
   * resolve offsets and allocate scratch here, and return the per-call function.
   */
  readonly build: (layout: ParameterLayout, data: ExactData) => Float64LogLikelihood;
}

export type Likelihood = TensorLikelihood | Float64Likelihood;

/** A named function of the constrained values recorded for every draw. */
export interface DerivedQuantity {
  /** Name: same rules as parameter names, distinct from them. */
  readonly name: string;
  /** Length of a vector quantity (named `name[0]` …); omit for a scalar. */
  readonly size?: number;
  /** The value(s) at the given constrained values. */
  readonly compute: (values: ExactValues, data: ExactData) => number | ArrayLike<number>;
}

/** Everything that defines a model. */
export interface ModelSpec {
  readonly parameters: readonly ParameterDeclaration[];
  /** Data: numbers and columns of finite numbers. */
  readonly data?: DataRecord;
  /**
   * Groups of data fields that must have equal lengths. Default: all column fields
   * form one group.
   */
  readonly sameLength?: readonly (readonly string[])[];
  /** Likelihood term(s), summed; omit for a prior-only model. */
  readonly likelihood?: Likelihood | readonly Likelihood[];
  /** Derived quantities recorded in the trace after the parameters. */
  readonly derived?: readonly DerivedQuantity[];
}

/** Wraps a TensorFlow.js log-likelihood. */
export function tensorLikelihood(logLikelihood: TensorLogLikelihood): TensorLikelihood {
  return { kind: 'tensorflow', logLikelihood };
}

/** Wraps a builder of a fused float64 log-likelihood. */
export function float64Likelihood(
  build: (layout: ParameterLayout, data: ExactData) => Float64LogLikelihood,
): Float64Likelihood {
  return { kind: 'float64', build };
}

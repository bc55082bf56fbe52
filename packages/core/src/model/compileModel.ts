import { z } from 'zod';
import type { Target, TargetOutputs } from '../target.js';
import { selectBackend, type BackendOptions } from '../tensorflow/backend.js';
import { validateData } from './data.js';
import { NAME_PATTERN, resolveParameters, type ResolvedParameter } from './declarations.js';
import { ModelDeclarationError, ParameterValueError } from './errors.js';
import { copyValues, exactValueView } from './exactValues.js';
import { buildLayout, type ParameterLayout } from './layout.js';
import type { RandomSource } from './priors/prior.js';
import type { DerivedQuantity, ExactData, ExactValues, Float64LogLikelihood, Likelihood, ModelSpec } from './spec.js';
import { strictRecord } from './strictRecord.js';
import { compileTensorTerm, dataTensors, type CompiledTerm } from './tensorTerm.js';

/** Options of {@link compileModel}. */
export interface CompileOptions extends BackendOptions {}

/** The parts of the log-density at one position, all float64. */
export interface LogDensityParts {
  /** Σ ln prior(θ) over parameters. */
  readonly logPrior: number;
  /** Σ ln |det ∂θ/∂u| (and the radial terms of angles). */
  readonly logJacobian: number;
  /** Σ ln L over likelihood terms. */
  readonly logLikelihood: number;
  /** The sum, as returned by `logDensityGrad`. */
  readonly total: number;
}

/**
 * A model compiled into a {@link Target} over the unconstrained position, with
 * helpers between positions and named constrained values.
 */
export interface CompiledModel extends Target {
  /** Names of the unconstrained coordinates, e.g. `offset`, `jitter.u`, `phase.u[1]`. */
  readonly names: readonly string[];
  /** Constrained values then derived quantities, recorded for every draw. */
  readonly outputs: TargetOutputs;
  /** Layout of the constrained vector (what fused float64 likelihoods see). */
  readonly layout: ParameterLayout;
  /** TensorFlow.js backend in use, or null when the model does not use TensorFlow.js. */
  readonly backend: string | null;
  /** Constrained named values at an unconstrained position (fresh arrays). */
  constrain(x: Float64Array): Record<string, number | Float64Array>;
  /** Unconstrained position of named constrained values (every parameter needed). */
  unconstrain(values: Readonly<Record<string, number | ArrayLike<number>>>): Float64Array;
  /** One draw from the prior, as named constrained values. */
  samplePrior(source: RandomSource): Record<string, number | Float64Array>;
  /**
   * An unconstrained starting position: the given values where provided, prior draws
   * for the other parameters (for `runChains` initialisation).
   */
  initialPosition(source: RandomSource, values?: Readonly<Record<string, number | ArrayLike<number>>>): Float64Array;
  /** The prior, Jacobian and likelihood parts of the log-density at x. */
  logDensityParts(x: Float64Array): LogDensityParts;
  /** Releases the data tensors held for a TensorFlow.js likelihood. */
  dispose(): void;
}

const specSchema = z
  .object({
    parameters: z.array(z.unknown()),
    data: z.record(z.string(), z.unknown()).optional(),
    sameLength: z.array(z.array(z.string())).optional(),
    likelihood: z.unknown().optional(),
    derived: z.array(z.unknown()).optional(),
  })
  .strict();

const likelihoodSchema = z.union([
  z.object({ kind: z.literal('tensorflow'), logLikelihood: z.custom<unknown>((f) => typeof f === 'function') }),
  z.object({ kind: z.literal('float64'), build: z.custom<unknown>((f) => typeof f === 'function') }),
]);

const derivedSchema = z.object({
  name: z.string().regex(NAME_PATTERN),
  size: z.number().int().min(1).optional(),
  compute: z.custom<unknown>((f) => typeof f === 'function'),
});

function checkSpec(spec: ModelSpec): { likelihoods: Likelihood[]; derived: DerivedQuantity[] } {
  const r = specSchema.safeParse(spec);
  if (!r.success) {
    const issue = r.error.issues[0];
    if (issue.code === 'unrecognized_keys') {
      throw new ModelDeclarationError(`model.${issue.keys[0]}`, (spec as unknown as Record<string, unknown>)[issue.keys[0]], 'no such field; a model has parameters, data, sameLength, likelihood, derived');
    }
    const key = issue.path.join('.');
    throw new ModelDeclarationError(key ? `model.${key}` : 'model', key ? (spec as unknown as Record<string, unknown>)[String(issue.path[0])] : spec, issue.message);
  }
  const raw = spec.likelihood === undefined ? [] : Array.isArray(spec.likelihood) ? spec.likelihood : [spec.likelihood];
  const likelihoods: Likelihood[] = [];
  for (const [i, l] of (raw as unknown[]).entries()) {
    if (!likelihoodSchema.safeParse(l).success) {
      throw new ModelDeclarationError(Array.isArray(spec.likelihood) ? `likelihood[${i}]` : 'likelihood', l, 'tensorLikelihood(fn) or float64Likelihood(build)');
    }
    likelihoods.push(l as Likelihood);
  }
  const derived: DerivedQuantity[] = [];
  for (const [i, d] of (spec.derived ?? []).entries()) {
    const dr = derivedSchema.safeParse(d);
    if (!dr.success) {
      const key = String(dr.error.issues[0].path[0] ?? '');
      throw new ModelDeclarationError(key ? `derived[${i}].${key}` : `derived[${i}]`, key ? (d as unknown as Record<string, unknown>)[key] : d, key === 'name' ? 'a letter or underscore followed by letters, digits or underscores' : key === 'size' ? 'an integer >= 1' : key === 'compute' ? 'a function (values, data) => number | number[]' : 'a derived quantity { name, size?, compute }');
    }
    derived.push(d);
  }
  return { likelihoods, derived };
}

function referencePosition(params: readonly ResolvedParameter[], dim: number): Float64Array {
  const x = new Float64Array(dim);
  for (const p of params) {
    if (p.support.kind === 'angle') for (let i = 0; i < p.size; i++) x[p.uAt + 2 * i] = 1;
  }
  return x;
}

/**
 * Compiles a model into a {@link CompiledModel} (a `Target` for `runChains`).
 *
 * Validates declarations and data first (errors name the field). Bijections, priors
 * and fused float64 likelihoods run in float64 JS; a TensorFlow.js likelihood runs on
 * the backend chosen by {@link selectBackend} (only then is TensorFlow.js loaded). The
 * gradient is chained in float64: ∂/∂u = (∂ ln L/∂θ + ∂ ln prior/∂θ) · ∂θ/∂u + ∂ ln|J|/∂u.
 * One trial evaluation at a reference position runs at compile time so that a typo in
 * a parameter or data name fails here, naming it.
 */
export async function compileModel(spec: ModelSpec, options: CompileOptions = {}): Promise<CompiledModel> {
  if (spec === null || typeof spec !== 'object') throw new ModelDeclarationError('model', spec, 'an object { parameters, data?, likelihood?, derived? }');
  const { likelihoods, derived } = checkSpec(spec);
  const params = resolveParameters(spec.parameters);
  const exactData: ExactData = validateData(spec.data, spec.sameLength);
  const layout = buildLayout(params);
  const dim = params.reduce((s, p) => s + p.uSize, 0);
  const names: string[] = [];
  for (const p of params) for (let k = 0; k < p.uSize; k++) names.push(p.support.coordinateName(p.name, p.size, p.scalar, k));

  // Derived quantities: names distinct from parameters and from each other.
  const taken = new Set(params.map((p) => p.name));
  const outputNames = [...layout.names];
  for (const [i, d] of derived.entries()) {
    if (taken.has(d.name)) throw new ModelDeclarationError(`derived[${i}].name`, d.name, 'a name not used by a parameter or another derived quantity');
    taken.add(d.name);
    if (d.size === undefined) outputNames.push(d.name);
    else for (let j = 0; j < d.size; j++) outputNames.push(`${d.name}[${j}]`);
  }

  const L = layout.length;
  const theta = new Float64Array(L);
  const gTheta = new Float64Array(L);
  const gLik = new Float64Array(L);
  const view = exactValueView(params, theta);

  const quiet = options.quiet === true || process.env.APSIS_QUIET === '1';
  const warn = (m: string): void => {
    if (!quiet) process.stderr.write(m + '\n');
  };

  // Likelihood terms.
  const fused: Float64LogLikelihood[] = [];
  const tensorTerms: CompiledTerm[] = [];
  let backend: string | null = null;
  let disposeData: (() => void) | undefined;
  for (const [i, l] of likelihoods.entries()) {
    if (l.kind === 'float64') {
      const f = l.build(layout, exactData);
      if (typeof f !== 'function') {
        throw new ModelDeclarationError(likelihoods.length > 1 ? `likelihood[${i}].build` : 'likelihood.build', f, 'a function returning (theta, grad) => number');
      }
      fused.push(f);
    }
  }
  if (likelihoods.some((l) => l.kind === 'tensorflow')) {
    const info = await selectBackend(options);
    backend = info.name;
    const tensors = dataTensors(info.tf, exactData);
    disposeData = () => info.tf.dispose(Object.values(tensors));
    for (const l of likelihoods) {
      if (l.kind === 'tensorflow') tensorTerms.push(compileTensorTerm(info.tf, params, l, view.values, exactData, tensors, warn));
    }
  }

  let trialRun = false;
  const needsView = tensorTerms.length > 0;
  const evaluate = (x: Float64Array, grad: Float64Array | null, parts: number[] | null): number => {
    let logJ = 0;
    for (let i = 0; i < params.length; i++) {
      const p = params[i];
      logJ += p.transform.forward(x, p.uAt, theta, p.at);
    }
    if (needsView) view.refresh();
    gTheta.fill(0);
    // Likelihood terms first: the first fused term writes straight into the zeroed
    // gradient (its contract: zero on entry), later ones go through their own buffer.
    let logLik = 0;
    for (let k = 0; k < fused.length; k++) {
      if (k === 0) {
        logLik += fused[0](theta, gTheta);
        continue;
      }
      gLik.fill(0);
      logLik += fused[k](theta, gLik);
      for (let i = 0; i < L; i++) gTheta[i] += gLik[i];
    }
    for (let k = 0; k < tensorTerms.length; k++) {
      logLik += trialRun ? tensorTerms[k].evaluate(theta, gTheta) : tensorTerms[k].trial(theta, gTheta);
    }
    let logPrior = 0;
    for (let i = 0; i < params.length; i++) logPrior += params[i].logPrior(theta, gTheta);
    if (grad !== null) {
      for (let i = 0; i < params.length; i++) {
        const p = params[i];
        p.transform.backward(x, p.uAt, theta, p.at, gTheta, p.at, grad, p.uAt);
      }
    }
    const total = logPrior + logJ + logLik;
    if (parts !== null) {
      parts[0] = logPrior;
      parts[1] = logJ;
      parts[2] = logLik;
    }
    return total === total ? total : -Infinity;
  };

  // Outputs: own buffers, so recording a draw never disturbs the gradient buffers.
  const outTheta = new Float64Array(L);
  const outView = exactValueView(params, outTheta);
  const writeOutputs = (x: Float64Array, out: Float64Array, values: ExactValues, data: ExactData): void => {
    for (const p of params) p.transform.forward(x, p.uAt, outTheta, p.at);
    outView.refresh();
    out.set(outTheta, 0);
    let k = L;
    for (const [i, d] of derived.entries()) {
      const v = d.compute(values, data);
      if (d.size === undefined) {
        if (typeof v !== 'number') throw new ModelDeclarationError(`derived[${i}] (${d.name})`, v, 'a number from compute');
        out[k++] = v;
      } else {
        const arr = v as ArrayLike<number>;
        if (typeof v === 'number' || arr.length !== d.size) {
          throw new ModelDeclarationError(`derived[${i}] (${d.name})`, v, `an array of length ${d.size} from compute`);
        }
        for (let j = 0; j < d.size; j++) out[k++] = arr[j];
      }
    }
  };
  const outputs: TargetOutputs = {
    names: outputNames,
    write: (x, out) => writeOutputs(x, out, outView.values, exactData),
  };

  const checkPosition = (x: unknown, field: string): Float64Array => {
    if (!(x instanceof Float64Array) || x.length !== dim) {
      throw new ParameterValueError(field, x, `a Float64Array of length ${dim} (the unconstrained dimension)`);
    }
    return x;
  };

  const scratch = new Float64Array(L);
  const toPosition = (
    values: Readonly<Record<string, number | ArrayLike<number>>>,
    fill: ((p: ResolvedParameter, into: Float64Array) => void) | null,
  ): Float64Array => {
    if (values === null || typeof values !== 'object') throw new ParameterValueError('values', values, 'an object of parameter values by name');
    for (const key of Object.keys(values)) {
      if (!params.some((p) => p.name === key)) {
        throw new ParameterValueError(`values.${key}`, values[key], `a declared parameter name: ${params.map((p) => p.name).join(', ')}`);
      }
    }
    const u = new Float64Array(dim);
    for (const p of params) {
      const v = values[p.name];
      if (v === undefined) {
        if (fill === null) throw new ParameterValueError(`values.${p.name}`, undefined, 'a value (every parameter needs one)');
        fill(p, scratch);
      } else if (p.scalar) {
        if (typeof v !== 'number' || !Number.isFinite(v)) throw new ParameterValueError(`values.${p.name}`, v, 'a finite number');
        scratch[p.at] = v;
      } else {
        const arr = v as ArrayLike<number>;
        if (typeof v === 'number' || typeof arr.length !== 'number' || arr.length !== p.size) {
          throw new ParameterValueError(`values.${p.name}`, v, `an array of ${p.size} numbers`);
        }
        for (let i = 0; i < p.size; i++) {
          if (typeof arr[i] !== 'number' || !Number.isFinite(arr[i])) throw new ParameterValueError(`values.${p.name}[${i}]`, arr[i], 'a finite number');
          scratch[p.at + i] = arr[i];
        }
      }
      if (!p.transform.inverse(scratch, p.at, u, p.uAt)) {
        const shown = p.scalar ? scratch[p.at] : Array.from(scratch.subarray(p.at, p.at + p.size));
        throw new ParameterValueError(`values.${p.name}`, p.scalar ? shown : `[${(shown as number[]).join(', ')}]`, `a value inside support ${p.support.description}`);
      }
    }
    return u;
  };

  const drawPrior = (p: ResolvedParameter, source: RandomSource, into: Float64Array): void => {
    if (p.samplePrior === undefined) {
      throw new ParameterValueError(`values.${p.name}`, undefined, `a value: its prior ${p.prior.description} cannot be sampled`);
    }
    p.samplePrior(source, into);
  };

  const model: CompiledModel = {
    dim,
    names,
    outputs,
    layout,
    backend,
    logDensityGrad: (x, grad) => evaluate(x, grad, null),
    constrain(x) {
      checkPosition(x, 'x');
      const t = new Float64Array(L);
      for (const p of params) p.transform.forward(x, p.uAt, t, p.at);
      return copyValues(params, t);
    },
    unconstrain: (values) => toPosition(values, null),
    samplePrior(source) {
      const t = new Float64Array(L);
      for (const p of params) drawPrior(p, source, t);
      return copyValues(params, t);
    },
    initialPosition: (source, values = {}) => toPosition(values, (p, into) => drawPrior(p, source, into)),
    logDensityParts(x) {
      checkPosition(x, 'x');
      const parts = [0, 0, 0];
      const total = evaluate(x, null, parts);
      return { logPrior: parts[0], logJacobian: parts[1], logLikelihood: parts[2], total };
    },
    dispose() {
      disposeData?.();
      disposeData = undefined;
    },
  };

  // Trial evaluation: user code runs once with name checks, before any sampling.
  const x0 = referencePosition(params, dim);
  evaluate(x0, new Float64Array(dim), null);
  trialRun = true;
  if (derived.length > 0) writeOutputs(x0, new Float64Array(outputNames.length), strictRecord(outView.values, 'values'), strictRecord(exactData, 'data'));
  return model;
}

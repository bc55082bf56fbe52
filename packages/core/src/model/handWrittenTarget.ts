import { z } from 'zod';
import type { Target, TargetOutputs } from '../target.js';
import { ModelDeclarationError, ParameterValueError } from './errors.js';

/** A user's own log-density with its gradient. */
export interface HandWrittenTargetSpec {
  /** Number of unconstrained coordinates. */
  readonly dim: number;
  /** Returns log p(x) and writes ∂ log p/∂x into grad. */
  readonly logDensityGrad: (x: Float64Array, grad: Float64Array) => number;
  /** Optional coordinate names (length dim). */
  readonly names?: readonly string[];
  /** Optional outputs recorded per draw. */
  readonly outputs?: TargetOutputs;
}

const specSchema = z.strictObject({
  dim: z.number().int().min(1),
  logDensityGrad: z.custom<HandWrittenTargetSpec['logDensityGrad']>((f) => typeof f === 'function'),
  names: z.array(z.string().min(1)).optional(),
  outputs: z
    .object({ names: z.array(z.string().min(1)), write: z.custom<TargetOutputs['write']>((f) => typeof f === 'function') })
    .optional(),
});

const EXPECTED: Record<string, string> = {
  dim: 'an integer >= 1',
  logDensityGrad: 'a function (x: Float64Array, grad: Float64Array) => number',
  names: 'an array of dim non-empty strings',
  outputs: 'an object { names: string[], write(x, out) }',
};

/**
 * Validates a hand-written target (for code that already has gradients) and returns
 * it as a {@link Target}; `runChains` accepts it like a compiled model.
 */
export function handWrittenTarget(spec: HandWrittenTargetSpec): Target {
  const r = specSchema.safeParse(spec);
  if (!r.success) {
    const issue = r.error.issues[0];
    const key = issue.code === 'unrecognized_keys' ? issue.keys[0] : String(issue.path[0] ?? '');
    throw new ModelDeclarationError(`target.${key}`, (spec as unknown as Record<string, unknown>)?.[key], EXPECTED[key] ?? `no such field; a target has ${Object.keys(EXPECTED).join(', ')}`);
  }
  if (spec.names !== undefined && spec.names.length !== spec.dim) {
    throw new ModelDeclarationError('target.names', spec.names, `an array of ${spec.dim} names (target.dim)`);
  }
  const target: Target = {
    dim: spec.dim,
    logDensityGrad: spec.logDensityGrad,
    ...(spec.names ? { names: [...spec.names] } : {}),
    ...(spec.outputs ? { outputs: spec.outputs } : {}),
  };
  return Object.freeze(target);
}

/** Result of {@link checkTargetGradient}. */
export interface GradientCheck {
  readonly analytic: Float64Array;
  readonly numerical: Float64Array;
  /** max |analytic − numerical| / max(1, |numerical|). */
  readonly maxError: number;
}

/**
 * Compares a target's gradient at x with float64 central differences (step
 * h · max(1, |xᵢ|), default h = 1e-6; error ∝ h² plus rounding ∝ ε/h).
 */
export function checkTargetGradient(target: Target, x: Float64Array, step = 1e-6): GradientCheck {
  if (!(x instanceof Float64Array) || x.length !== target.dim) {
    throw new ParameterValueError('x', x, `a Float64Array of length ${target.dim} (target.dim)`);
  }
  const n = target.dim;
  const analytic = new Float64Array(n);
  target.logDensityGrad(x, analytic);
  const numerical = new Float64Array(n);
  const scratch = new Float64Array(n);
  const y = x.slice();
  let maxError = 0;
  for (let i = 0; i < n; i++) {
    const h = step * Math.max(1, Math.abs(x[i]));
    y[i] = x[i] + h;
    const up = target.logDensityGrad(y, scratch);
    y[i] = x[i] - h;
    const down = target.logDensityGrad(y, scratch);
    y[i] = x[i];
    numerical[i] = (up - down) / (2 * h);
    maxError = Math.max(maxError, Math.abs(analytic[i] - numerical[i]) / Math.max(1, Math.abs(numerical[i])));
  }
  return { analytic, numerical, maxError };
}

import { z } from 'zod';
import { ModelDeclarationError } from './errors.js';
import { logGamma } from './math/logGamma.js';
import { dirichlet } from './priors/dirichlet.js';
import { isVectorPrior, type Prior, type RandomSource } from './priors/prior.js';
import { uniform } from './priors/uniform.js';
import type { ParameterDeclaration } from './spec.js';
import { real } from './supports/real.js';
import type { Support, Transform } from './supports/transform.js';

/** A parameter with defaults filled in, its transform bound and its offsets fixed. */
export interface ResolvedParameter {
  readonly name: string;
  readonly size: number;
  readonly scalar: boolean;
  readonly support: Support;
  readonly prior: Prior;
  readonly transform: Transform;
  /** Offset in the constrained vector. */
  readonly at: number;
  /** Offset in the unconstrained position. */
  readonly uAt: number;
  /** Number of unconstrained coordinates. */
  readonly uSize: number;
  /** Adds ∂ ln prior/∂θ into gTheta and returns ln prior for θ at `at`. */
  readonly logPrior: (theta: Float64Array, gTheta: Float64Array) => number;
  /** Writes a prior draw of the constrained values at `out[at …]`, or throws if improper. */
  readonly samplePrior: ((source: RandomSource, out: Float64Array) => void) | undefined;
}

export const NAME_PATTERN = /^[A-Za-z_][A-Za-z0-9_]*$/;

const declarationSchema = z.object({
  name: z.string().regex(NAME_PATTERN),
  size: z.number().int().min(1).optional(),
  support: z.custom<Support>((s) => typeof s === 'object' && s !== null && typeof (s as Support).bind === 'function').optional(),
  prior: z
    .custom<Prior>((p) => typeof p === 'object' && p !== null && typeof (p as Prior).logDensity === 'function')
    .optional(),
});

const EXPECTED: Record<string, string> = {
  name: 'a letter or underscore followed by letters, digits or underscores',
  size: 'an integer >= 1 (omit it for a scalar)',
  support: 'a support from `supports` (e.g. supports.positive())',
  prior: 'a prior from `priors` (e.g. priors.normal(0, 1))',
};

function defaultPrior(support: Support, field: string): Prior {
  switch (support.kind) {
    case 'interval':
      return uniform(support.lower, support.upper);
    case 'angle':
      return uniform(-Math.PI, Math.PI);
    case 'simplex':
      return dirichlet(1);
    default:
      throw new ModelDeclarationError(
        `${field}.prior`,
        undefined,
        `a prior: support ${support.description} has no proper default prior (use priors.flat() for an improper flat one)`,
      );
  }
}

function checkPrior(support: Support, prior: Prior, size: number, field: string): void {
  if (isVectorPrior(prior)) {
    if (!prior.supportKinds.includes(support.kind)) {
      throw new ModelDeclarationError(`${field}.prior`, prior.description, `a prior for support ${support.description}; ${prior.description} needs ${prior.supportKinds.join(' or ')}`);
    }
    if (prior.length !== undefined && prior.length !== size) {
      throw new ModelDeclarationError(`${field}.prior`, prior.description, `a prior of length ${size}, the parameter's size`);
    }
    return;
  }
  if (support.kind === 'simplex') {
    throw new ModelDeclarationError(`${field}.prior`, prior.description, 'a prior on the whole simplex (priors.dirichlet)');
  }
  if (support.kind === 'angle') {
    if (!prior.circular) {
      throw new ModelDeclarationError(`${field}.prior`, prior.description, 'a density on the circle for an angle: priors.uniform(-Math.PI, Math.PI) or a custom prior with circular: true');
    }
    return;
  }
  if (prior.kind === 'flat') return;
  if (prior.lower > support.lower || prior.upper < support.upper) {
    throw new ModelDeclarationError(
      `${field}.prior`,
      prior.description,
      `a prior whose support [${prior.lower}, ${prior.upper}] covers the parameter's support ${support.description} = (${support.lower}, ${support.upper})`,
    );
  }
}

function priorEvaluator(prior: Prior, at: number, size: number, support: Support): ResolvedParameter['logPrior'] {
  if (isVectorPrior(prior)) {
    return (theta, g) => {
      const lp = prior.logDensity(theta, at, size);
      prior.addGradient(theta, at, size, g, at);
      return lp;
    };
  }
  // Independent elements; on an ordered vector the density of the sorted draws is
  // n! Π p(θᵢ), so the constant ln n! keeps the prior normalised.
  const constant = support.kind === 'ordered' ? logGamma(size + 1) : 0;
  const f = prior.logDensity;
  const d = prior.logDensityDerivative;
  if (size === 1) {
    return (theta, g) => {
      const x = theta[at];
      g[at] += d(x);
      return f(x) + constant;
    };
  }
  return (theta, g) => {
    let lp = constant;
    for (let i = at; i < at + size; i++) {
      const x = theta[i];
      lp += f(x);
      g[i] += d(x);
    }
    return lp;
  };
}

function priorSampler(prior: Prior, at: number, size: number, support: Support): ResolvedParameter['samplePrior'] {
  if (!prior.proper || prior.sample === undefined) return undefined;
  if (isVectorPrior(prior)) {
    const s = prior.sample;
    return (source, out) => s(source, out, at, size);
  }
  const s = prior.sample;
  const sorted = support.kind === 'ordered';
  return (source, out) => {
    for (let i = at; i < at + size; i++) out[i] = s(source);
    if (sorted && size > 1) out.subarray(at, at + size).sort();
  };
}

/** Validates the declarations, fills in defaults and fixes offsets. */
export function resolveParameters(declarations: readonly ParameterDeclaration[]): ResolvedParameter[] {
  if (!Array.isArray(declarations) || declarations.length === 0) {
    throw new ModelDeclarationError('parameters', declarations, 'a non-empty array of parameter declarations');
  }
  const seen = new Set<string>();
  const out: ResolvedParameter[] = [];
  let at = 0;
  let uAt = 0;
  for (const [i, decl] of declarations.entries()) {
    const field = typeof decl?.name === 'string' && NAME_PATTERN.test(decl.name) ? `parameters.${decl.name}` : `parameters[${i}]`;
    const r = declarationSchema.safeParse(decl);
    if (!r.success) {
      const key = String(r.error.issues[0].path[0] ?? '');
      const value = key === '' ? decl : (decl as unknown as Record<string, unknown>)[key];
      throw new ModelDeclarationError(key === '' ? field : `${field}.${key}`, value, EXPECTED[key] ?? 'a parameter declaration { name, size?, support?, prior? }');
    }
    const name = decl.name;
    if (seen.has(name)) throw new ModelDeclarationError(`parameters[${i}].name`, name, 'a name not already declared');
    seen.add(name);
    const scalar = decl.size === undefined;
    const size = decl.size ?? 1;
    const support = decl.support ?? real();
    if (size < support.minLength) {
      throw new ModelDeclarationError(`${field}.size`, decl.size, `an integer >= ${support.minLength} for support ${support.description}`);
    }
    if (support.joint && scalar && support.kind !== 'ordered') {
      throw new ModelDeclarationError(`${field}.size`, decl.size, `a vector size for support ${support.description}`);
    }
    const prior = decl.prior ?? defaultPrior(support, field);
    checkPrior(support, prior, size, field);
    const transform = support.bind(size);
    const uSize = transform.unconstrainedLength;
    out.push({
      name,
      size,
      scalar,
      support,
      prior,
      transform,
      at,
      uAt,
      uSize,
      logPrior: priorEvaluator(prior, at, size, support),
      samplePrior: priorSampler(prior, at, size, support),
    });
    at += size;
    uAt += uSize;
  }
  return out;
}

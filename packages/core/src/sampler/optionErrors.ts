import type { z } from 'zod';
import { SamplerOptionsError } from './errors.js';

/** A short, readable rendering of an option's value for error messages. */
export function describeValue(value: unknown): string {
  if (value === undefined) return 'undefined';
  if (value === null) return 'null';
  if (typeof value === 'function') return 'a function';
  if (typeof value === 'string') return JSON.stringify(value);
  if (typeof value === 'number' || typeof value === 'boolean' || typeof value === 'bigint') {
    return String(value);
  }
  if (ArrayBuffer.isView(value)) {
    return `${value.constructor.name}(${(value as unknown as { length: number }).length})`;
  }
  if (Array.isArray(value)) return `an array of length ${value.length}`;
  return 'an object';
}

function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) {
    out += typeof key === 'number' ? `[${key}]` : out === '' ? String(key) : `.${String(key)}`;
  }
  return out;
}

function valueAt(input: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = input;
  for (const key of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[key as string];
  }
  return v;
}

/**
 * Parses `input` with `schema`; on failure throws a {@link SamplerOptionsError} naming
 * the first offending option, its value and what was expected. `expected` maps each
 * top-level option to a description of its valid values.
 */
export function parseOptions<S extends z.ZodType>(
  schema: S,
  input: unknown,
  entry: string,
  expected: Readonly<Record<string, string>>,
): z.output<S> {
  if (input !== undefined && (input === null || typeof input !== 'object' || Array.isArray(input))) {
    throw new SamplerOptionsError(`${entry}: options = ${describeValue(input)}: expected an object`);
  }
  const result = schema.safeParse(input ?? {});
  if (result.success) return result.data;
  const issue = result.error.issues[0];
  if (issue.code === 'unrecognized_keys') {
    const keys = (issue as { keys: string[] }).keys;
    throw new SamplerOptionsError(
      `${entry}: unknown option ${keys.map((k) => `\`${k}\``).join(', ')}; known options: ${Object.keys(expected).join(', ')}`,
    );
  }
  const path = issue.path;
  const top = path.length > 0 ? String(path[0]) : '';
  const what = expected[top] ?? issue.message;
  const detail = path.length > 1 ? ` (${issue.message})` : '';
  throw new SamplerOptionsError(
    `${entry}: option \`${formatPath(path)}\` = ${describeValue(valueAt(input, path))}: expected ${what}${detail}`,
  );
}

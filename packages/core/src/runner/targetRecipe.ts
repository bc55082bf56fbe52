import { createRequire } from 'node:module';
import { isAbsolute, join, resolve as resolvePath } from 'node:path';
import { pathToFileURL } from 'node:url';
import { z } from 'zod';
import type { Target } from '../target.js';
import { TargetRecipeError } from './errors.js';

/** JSON data: what a recipe may carry as arguments. */
export type JsonValue = string | number | boolean | null | JsonValue[] | { [key: string]: JsonValue };

/**
 * How to build a target in another thread or process: import `module`, take its export
 * `exportName` (a function) and call it with `args`; the function returns a `Target`
 * or a promise of one. Only data crosses threads, so this is what worker threads and
 * resumed runs rebuild targets from.
 */
export interface TargetRecipe {
  /**
   * The module: an absolute file path, a `file:` URL, or a package specifier such as
   * `@apsis/models`. Relative paths are resolved against the current directory when a
   * run starts and stored absolute.
   */
  readonly module: string;
  /** Name of the factory export (default `'default'`). */
  readonly exportName?: string;
  /** JSON arguments for the factory (default `null`). */
  readonly args?: JsonValue;
}

/** A recipe with every field present, as stored in a run folder's manifest. */
export interface ResolvedTargetRecipe {
  readonly module: string;
  readonly exportName: string;
  readonly args: JsonValue;
}

const identifier = /^[A-Za-z_$][A-Za-z0-9_$]*$/;

/** Zod schema of a stored recipe (strict: no other fields). */
export const targetRecipeSchema = z.strictObject({
  module: z.string().min(1).max(4096),
  exportName: z.string().regex(identifier, 'expected a JavaScript identifier').max(200),
  args: z.json(),
});

/** True for an object that looks like a recipe (has a string `module` and no `logDensityGrad`). */
export function isTargetRecipe(value: unknown): value is TargetRecipe {
  return (
    value !== null &&
    typeof value === 'object' &&
    typeof (value as { module?: unknown }).module === 'string' &&
    typeof (value as { logDensityGrad?: unknown }).logDensityGrad !== 'function'
  );
}

/** True when `specifier` names a package (not a path or URL). */
export function isPackageSpecifier(specifier: string): boolean {
  return !isAbsolute(specifier) && !/^[a-zA-Z][a-zA-Z0-9+.-]*:/.test(specifier) && !specifier.startsWith('.');
}

/**
 * Validates a recipe and fills in defaults; a relative module path is made absolute
 * against `cwd`. Throws {@link TargetRecipeError} naming the bad field.
 */
export function resolveTargetRecipe(recipe: unknown, cwd = process.cwd()): ResolvedTargetRecipe {
  if (recipe === null || typeof recipe !== 'object' || Array.isArray(recipe)) {
    throw new TargetRecipeError(`target recipe = ${String(recipe)}: expected an object { module, exportName?, args? }`);
  }
  const r = recipe as Record<string, unknown>;
  const filled = {
    module: r.module,
    exportName: r.exportName ?? 'default',
    args: r.args === undefined ? null : r.args,
    ...Object.fromEntries(Object.entries(r).filter(([k]) => !['module', 'exportName', 'args'].includes(k))),
  };
  const parsed = targetRecipeSchema.safeParse(filled);
  if (!parsed.success) {
    const issue = parsed.error.issues[0];
    if (issue.code === 'unrecognized_keys') {
      throw new TargetRecipeError(`target recipe: unknown field ${issue.keys.map((k) => `\`${k}\``).join(', ')}; a recipe has module, exportName, args`);
    }
    const field = String(issue.path[0] ?? '');
    const what =
      field === 'module'
        ? 'a non-empty string: an absolute path, a file: URL or a package specifier'
        : field === 'exportName'
          ? 'the name of an export (a JavaScript identifier)'
          : 'JSON data (numbers, strings, booleans, null, arrays, plain objects)';
    const value = field === 'args' ? 'a value that is not JSON data' : JSON.stringify(filled[field as keyof typeof filled]);
    throw new TargetRecipeError(`target recipe: field \`${field}\` = ${value}: expected ${what}`);
  }
  const p = parsed.data;
  const module = p.module.startsWith('.') ? resolvePath(cwd, p.module) : p.module;
  return { module, exportName: p.exportName, args: p.args as JsonValue };
}

/** The URL or specifier to `import()` for a recipe's module. */
export function moduleImportSpecifier(module: string, cwd = process.cwd()): string {
  if (isAbsolute(module)) return pathToFileURL(module).href;
  if (!isPackageSpecifier(module)) return module;
  try {
    // Resolve from the current directory first, so a user's own packages are found.
    return pathToFileURL(createRequire(join(cwd, 'noop.js')).resolve(module)).href;
  } catch {
    return module;
  }
}

/**
 * Checks that `value` is a usable `Target` (integer `dim` ≥ 1, a `logDensityGrad`
 * function, optional `names` of length `dim`, optional `outputs` with names and a
 * `write` function). `origin` names where it came from, for the message.
 */
export function checkTarget(value: unknown, origin: string): Target {
  const t = value as Partial<Target> | null;
  if (t === null || typeof t !== 'object') {
    throw new TargetRecipeError(`${origin}: got ${String(value)}: expected a target { dim, logDensityGrad }`);
  }
  if (!Number.isInteger(t.dim) || (t.dim as number) < 1) {
    throw new TargetRecipeError(`${origin}: target.dim = ${String(t.dim)}: expected an integer >= 1`);
  }
  if (typeof t.logDensityGrad !== 'function') {
    throw new TargetRecipeError(`${origin}: target.logDensityGrad is ${typeof t.logDensityGrad}: expected a function (x, grad) => number`);
  }
  if (t.names !== undefined && (!Array.isArray(t.names) || t.names.length !== t.dim || !t.names.every((n) => typeof n === 'string'))) {
    throw new TargetRecipeError(`${origin}: target.names must be ${t.dim} strings (one per coordinate)`);
  }
  if (t.outputs !== undefined) {
    const o = t.outputs;
    if (o === null || typeof o !== 'object' || !Array.isArray(o.names) || !o.names.every((n) => typeof n === 'string') || typeof o.write !== 'function') {
      throw new TargetRecipeError(`${origin}: target.outputs must be { names: string[], write(x, out) }`);
    }
  }
  return t as Target;
}

/**
 * Builds the target a recipe describes: imports the module (this evaluates its code,
 * so only pass recipes you trust), calls the export with `args` and checks the result.
 * Throws {@link TargetRecipeError} saying which step failed.
 */
export async function loadRecipeTarget(recipe: TargetRecipe | ResolvedTargetRecipe): Promise<Target> {
  const r = resolveTargetRecipe(recipe);
  let mod: Record<string, unknown>;
  try {
    mod = (await import(moduleImportSpecifier(r.module))) as Record<string, unknown>;
  } catch (e) {
    throw new TargetRecipeError(`target recipe: cannot import module ${JSON.stringify(r.module)}: ${(e as Error).message}`);
  }
  const factory = mod[r.exportName];
  if (typeof factory !== 'function') {
    const known = Object.keys(mod).filter((k) => typeof mod[k] === 'function');
    throw new TargetRecipeError(
      `target recipe: export \`${r.exportName}\` of ${JSON.stringify(r.module)} is ${typeof factory}: expected a function (args) => Target; functions exported: ${known.join(', ') || 'none'}`,
    );
  }
  let built: unknown;
  try {
    built = await (factory as (args: JsonValue) => unknown)(r.args);
  } catch (e) {
    throw new TargetRecipeError(`target recipe: ${r.exportName}(args) of ${JSON.stringify(r.module)} threw: ${(e as Error).message}`);
  }
  return checkTarget(built, `target recipe ${r.exportName}(args) of ${JSON.stringify(r.module)}`);
}

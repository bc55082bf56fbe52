import { z } from 'zod';
import { ModelDataError, ModelDeclarationError } from './errors.js';
import type { DataRecord, ExactData } from './spec.js';

const finite = z.number();
const column = z.array(z.number()).min(1);
const fieldName = z.string().regex(/^[A-Za-z_][A-Za-z0-9_]*$/);

function isNumericTypedArray(v: unknown): v is Float64Array | Float32Array | Int32Array {
  return ArrayBuffer.isView(v) && !(v instanceof DataView) && !(v instanceof BigInt64Array) && !(v instanceof BigUint64Array);
}

/**
 * Validates data (finite numbers, non-empty columns, equal lengths within each
 * group) and copies it to float64. Errors name the field, and the row for bad entries.
 */
export function validateData(
  data: DataRecord | undefined,
  sameLength: readonly (readonly string[])[] | undefined,
): ExactData {
  if (data === undefined) return {};
  if (data === null || typeof data !== 'object' || Array.isArray(data)) {
    throw new ModelDataError('data', data, 'an object of numbers and arrays of numbers');
  }
  const out: Record<string, number | Float64Array> = {};
  for (const [key, value] of Object.entries(data)) {
    if (!fieldName.safeParse(key).success) {
      throw new ModelDataError('data field name', key, 'a letter or underscore followed by letters, digits or underscores');
    }
    if (typeof value === 'number') {
      if (!finite.safeParse(value).success) throw new ModelDataError(key, value, 'a finite number');
      out[key] = value;
    } else if (Array.isArray(value)) {
      const r = column.safeParse(value);
      if (!r.success) {
        const issue = r.error.issues[0];
        if (issue.path.length === 0) throw new ModelDataError(key, value, 'a non-empty array of finite numbers');
        const row = Number(issue.path[0]);
        throw new ModelDataError(key, value[row], 'a finite number', row);
      }
      out[key] = Float64Array.from(r.data);
    } else if (isNumericTypedArray(value)) {
      const arr = value as unknown as ArrayLike<number>;
      if (arr.length === 0) throw new ModelDataError(key, value, 'a non-empty array of finite numbers');
      for (let i = 0; i < arr.length; i++) {
        if (!Number.isFinite(arr[i])) throw new ModelDataError(key, arr[i], 'a finite number', i);
      }
      out[key] = Float64Array.from(arr);
    } else {
      throw new ModelDataError(key, value, 'a finite number or an array (or typed array) of finite numbers');
    }
  }
  const columns = Object.keys(out).filter((k) => typeof out[k] !== 'number');
  const groups = sameLength ?? (columns.length > 1 ? [columns] : []);
  for (const [g, group] of groups.entries()) {
    if (!Array.isArray(group)) throw new ModelDeclarationError(`sameLength[${g}]`, group, 'an array of data field names');
    let first: string | undefined;
    for (const name of group) {
      if (!(name in out)) {
        throw new ModelDeclarationError(`sameLength[${g}]`, name, `a data field name (have: ${Object.keys(out).join(', ')})`);
      }
      const v = out[name];
      if (typeof v === 'number') throw new ModelDeclarationError(`sameLength[${g}]`, name, 'a column field, not a number');
      if (first === undefined) {
        first = name;
        continue;
      }
      const n = (out[first] as Float64Array).length;
      if (v.length !== n) {
        throw new ModelDataError(`${name}.length`, v.length, `${n}, the length of data field '${first}'`);
      }
    }
  }
  return out;
}

import { ModelDeclarationError } from './errors.js';

/**
 * Wraps a record so that reading an unknown name throws, naming it. Used only on the
 * trial evaluation at compile time, so a typo in a likelihood or derived quantity
 * fails before sampling, while later calls run on the plain record.
 */
export function strictRecord<T extends object>(record: T, field: string): T {
  return new Proxy(record, {
    get(target, key, receiver) {
      if (typeof key === 'string' && !(key in target)) {
        throw new ModelDeclarationError(`${field}.${key}`, undefined, `one of the names ${field} holds: ${Object.keys(target).join(', ') || '(none)'}`);
      }
      return Reflect.get(target, key, receiver);
    },
  });
}

/** A TensorFlow.js backend was requested that is unknown or cannot be started. */
export class BackendSelectionError extends Error {
  override readonly name = 'BackendSelectionError';
  constructor(readonly field: string, readonly value: unknown, readonly expected: string) {
    super(`${field} = ${typeof value === 'string' ? JSON.stringify(value) : String(value)}: expected ${expected}`);
  }
}

/**
 * Errors meant for people. `InputError` means the user gave something we
 * cannot use (exit code 2); anything else that escapes is a bug (exit code 1).
 */
export class InputError extends Error {
  override readonly name = 'InputError';
  /** Stable machine-readable code, e.g. 'csv.ragged-row'. */
  readonly code: string;
  constructor(code: string, message: string) {
    super(message);
    this.code = code;
  }
}

/** Thrown when an internal invariant breaks: always a bug, never the user's fault. */
export class InternalError extends Error {
  override readonly name = 'InternalError';
}

export function assert(condition: unknown, message: string): asserts condition {
  if (!condition) throw new InternalError(message);
}

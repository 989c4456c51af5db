/**
 * Error kinds shared by every room. Each has a literal `name` (so it survives a process boundary)
 * and a stable `code`. Bad input and non-convergence are final: the queue never retries them.
 */

/** Input that can never succeed: names the offending field (a dotted path such as `burns[0].epoch`). */
export class InvalidInputError extends Error {
  override readonly name = 'InvalidInputError';
  readonly code: string;
  readonly field: string;
  constructor(field: string, message: string, code = 'INVALID_INPUT') {
    super(`${field}: ${message}`);
    this.field = field;
    this.code = code;
  }
}

/** An epoch outside the span a source (ephemeris, leap-second table, tabulated file) covers. */
export class OutOfSpanError extends Error {
  override readonly name = 'OutOfSpanError';
  readonly code = 'OUT_OF_SPAN';
  readonly field: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.field = field;
  }
}

/** Work stopped because its AbortSignal fired. */
export class CancelledError extends Error {
  override readonly name = 'CancelledError';
  readonly code = 'CANCELLED';
  constructor(message = 'cancelled') {
    super(message);
  }
}

/** True for errors that are the caller's fault and must never be retried. */
export function isFinalError(error: unknown): boolean {
  return error instanceof Error && (error.name === 'InvalidInputError' || error.name === 'OutOfSpanError'
    || error.name === 'CancelledError');
}

/** Dotted path of a field from a zod issue path: `burns[0].epoch`, or `body.problem.burns[0].epoch` under
 * `root`; `(problem)` for the whole value. */
export function issuePath(path: readonly PropertyKey[], root = ''): string {
  let out = root;
  for (const part of path) {
    if (typeof part === 'number') out += `[${part}]`;
    else out += out === '' ? String(part) : `.${String(part)}`;
  }
  return out === '' ? '(problem)' : out;
}

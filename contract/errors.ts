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

/**
 * The one list of error kinds that end a job for good (never retried), by `name` so it holds after a process
 * or thread boundary: the caller's fault (bad input, out of span, cancelled, a zod refusal), programming
 * errors (TypeError, RangeError, ReferenceError, SyntaxError), which a retry only repeats, and the archive's
 * refusal of a plan for a job already recorded as cancelled or failed (retrying cannot change that).
 */
export const FINAL_ERROR_NAMES: ReadonlySet<string> = new Set([
  'InvalidInputError', 'OutOfSpanError', 'CancelledError', 'ZodError',
  'TypeError', 'RangeError', 'ReferenceError', 'SyntaxError',
  'ArchiveConflictError',
]);

/** True when a failure with this error must not be retried (see FINAL_ERROR_NAMES); transient ones give false. */
export function isFinalError(error: unknown): boolean {
  return error instanceof Error && FINAL_ERROR_NAMES.has(error.name);
}

/** A failure as data, the shape in which it crosses a process boundary and reaches clients. */
export interface FailureData { name: string; code?: string; field?: string; message: string }

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

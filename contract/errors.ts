/**
 * Error kinds shared by every room. Each has a literal `name` (so it survives a process boundary)
 * and a stable `code`. Bad input and non-convergence are final: the queue never retries them.
 */

/** Input that can never succeed: names the offending field (a dotted path such as `burns[0].epoch`). */
export class InvalidInputError extends Error {
  override readonly name = 'InvalidInputError';
  readonly code: string;
  readonly field: string;
  /** The message without the `field: ` prefix `message` carries. */
  readonly detail: string;
  constructor(field: string, message: string, code = 'INVALID_INPUT') {
    super(`${field}: ${message}`);
    this.field = field;
    this.detail = message;
    this.code = code;
  }
}

/** An epoch outside the span a source (ephemeris, leap-second table, tabulated file) covers. */
export class OutOfSpanError extends Error {
  override readonly name = 'OutOfSpanError';
  readonly code = 'OUT_OF_SPAN';
  readonly field: string;
  /** The message without the `field: ` prefix `message` carries. */
  readonly detail: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.field = field;
    this.detail = message;
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

/**
 * A failure as data, the shape in which it crosses thread, process and queue boundaries and reaches clients:
 * `name` classifies it (FINAL_ERROR_NAMES), `code` is stable for programs, `field` the dotted path of the
 * offending input when known, and `message` the explanation without that field prefix.
 */
export interface FailureData { name: string; code: string; field?: string; message: string }

/** The code of a failure whose error carries none. */
const DEFAULT_FAILURE_CODE = 'FAILED';

/**
 * Any thrown value as FailureData: the one place an error becomes data. Reads `name`, `code`, `field` and
 * `detail` (the message without its field prefix) when the error has them, so nothing parses text back.
 */
export function failureOf(error: unknown): FailureData {
  if (!(error instanceof Error)) return { name: 'Error', code: DEFAULT_FAILURE_CODE, message: String(error) };
  const e = error as Error & { code?: unknown; field?: unknown; detail?: unknown };
  return {
    name: e.name,
    code: typeof e.code === 'string' ? e.code : DEFAULT_FAILURE_CODE,
    ...(typeof e.field === 'string' ? { field: e.field } : {}),
    message: typeof e.detail === 'string' ? e.detail : e.message,
  };
}

/** A failure rebuilt as an Error on the far side of a boundary; `name` keeps the original kind, so
 * isFinalError classifies it as it would the original. */
export class FailureError extends Error {
  override readonly name: string;
  readonly code: string;
  readonly field?: string;
  readonly detail: string;
  constructor(readonly failure: FailureData) {
    super(failure.field ? `${failure.field}: ${failure.message}` : failure.message);
    this.name = failure.name;
    this.code = failure.code;
    this.detail = failure.message;
    if (failure.field !== undefined) this.field = failure.field;
  }
}

/** One line for people (logs, the queue library's failedReason): `Name [field]: message`. Never parsed back. */
export function failureText(f: FailureData): string {
  return `${f.name}${f.field ? ` [${f.field}]` : ''}: ${f.message}`;
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

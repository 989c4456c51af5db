/**
 * Errors of the archive. Each has a literal `name` and a stable `code` so callers (the API maps them to
 * HTTP answers) can classify them after a process boundary.
 */

/** A record that cannot be archived as given (names the offending path in the record). */
export class ArchiveInputError extends Error {
  override readonly name = 'ArchiveInputError';
  readonly code = 'ARCHIVE_INPUT';
  readonly field: string;
  constructor(field: string, message: string) {
    super(`${field}: ${message}`);
    this.field = field;
  }
}

/** The plan (or job) asked for is not in the archive. */
export class ArchiveNotFoundError extends Error {
  override readonly name = 'ArchiveNotFoundError';
  readonly code = 'NOT_FOUND';
  constructor(message: string) {
    super(message);
  }
}

/**
 * The plan table (a projection) disagrees with the archive entries it is derived from — someone edited the
 * database by hand. Writes that depend on it are refused until an auditor has run `veer verify`. Maps to 409.
 */
export class ArchiveIntegrityError extends Error {
  override readonly name = 'ArchiveIntegrityError';
  readonly code = 'ARCHIVE_INCONSISTENT';
  constructor(message: string) {
    super(message);
  }
}

/**
 * The request conflicts with the current state, read under the store's write lock: a plan already
 * decided or superseded, or a review that lost a race with another. Maps to HTTP 409.
 */
export class ArchiveConflictError extends Error {
  override readonly name = 'ArchiveConflictError';
  readonly code = 'CONFLICT';
  readonly currentState: string | undefined;
  constructor(message: string, currentState?: string) {
    super(message);
    this.currentState = currentState;
  }
}

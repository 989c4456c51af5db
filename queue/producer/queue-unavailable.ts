/**
 * Redis out of reach, as one error kind: the producer refuses at once while its connection is down (instead
 * of queueing the command and failing seconds later); `isQueueUnavailable` also recognises the connection
 * errors ioredis throws mid-command. The API answers both 503 with Retry-After.
 */

/** Seconds a client should wait before retrying while Redis is unavailable (ioredis retries every ≤ 2 s). */
export const QUEUE_RETRY_AFTER_S = 5;

export class QueueUnavailableError extends Error {
  override readonly name = 'QueueUnavailableError';
  readonly code = 'QUEUE_UNAVAILABLE';
  /** Suggested wait before a retry, s. */
  readonly retryAfterS = QUEUE_RETRY_AFTER_S;
  constructor(message: string) { super(message); }
}

/** ioredis's signs of a lost connection (names and messages of v5). */
const CONNECTION_ERROR_NAMES = new Set(['MaxRetriesPerRequestError']);
const CONNECTION_ERROR_MESSAGES = [/connection is closed/i, /stream isn't writeable/i, /ECONNREFUSED/, /ECONNRESET/, /ETIMEDOUT/, /EPIPE/];

/** True for QueueUnavailableError and for the errors ioredis throws when the connection is lost. */
export function isQueueUnavailable(error: unknown): boolean {
  if (!(error instanceof Error)) return false;
  if (error instanceof QueueUnavailableError || CONNECTION_ERROR_NAMES.has(error.name)) return true;
  return CONNECTION_ERROR_MESSAGES.some((re) => re.test(error.message));
}

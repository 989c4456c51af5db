/**
 * JSON errors: `{ error: { code, message, issues? } }`. Never a stack trace in a response: unexpected
 * errors are logged with their stack and answered with a plain 500 and the request id.
 */
import type { ErrorRequestHandler, Request, RequestHandler, Response } from 'express';
import type { Logger } from 'pino';
import { isQueueUnavailable, QUEUE_RETRY_AFTER_S, type AdmissionRefusal } from '../queue/index.ts';

/** One failing field: `path` is dotted with [i] for array items, rooted at body/query/params. */
export interface FieldIssue { path: string; message: string; code?: string }

/** An error with an HTTP status, safe to show the client. */
export class HttpError extends Error {
  override readonly name = 'HttpError';
  constructor(readonly status: number, readonly code: string, message: string, readonly issues?: FieldIssue[]) {
    super(message);
  }
}

export function sendError(res: Response, status: number, code: string, message: string, issues?: FieldIssue[]): void {
  if (res.headersSent) return;
  res.status(status).json({ error: { code, message, ...(issues ? { issues } : {}) } });
}

/**
 * A submission refused by admission control, with the numbers: 503 QUEUE_FULL (the priority's waiting jobs
 * are at their limit) or 429 SUBMITTER_QUEUE_FULL (this submitter's unfinished jobs are); Retry-After either way.
 */
export function sendAdmissionRefusal(res: Response, refusal: AdmissionRefusal): void {
  res.set('Retry-After', String(refusal.retryAfterS));
  if (refusal.outcome === 'queue-full') {
    res.status(503).json({ error: {
      code: 'QUEUE_FULL', message: `${refusal.waiting} ${refusal.priority} jobs wait for a worker (limit ${refusal.limit}); retry in ${refusal.retryAfterS} s`,
      priority: refusal.priority, waiting: refusal.waiting, limit: refusal.limit, retryAfterS: refusal.retryAfterS,
    } });
    return;
  }
  res.status(429).json({ error: {
    code: 'SUBMITTER_QUEUE_FULL', message: `${refusal.unfinished} of your jobs are not finished (limit ${refusal.limit}); retry in ${refusal.retryAfterS} s`,
    unfinished: refusal.unfinished, limit: refusal.limit, retryAfterS: refusal.retryAfterS,
  } });
}

/** 404 for every route nobody answered. */
export const notFound: RequestHandler = (req, res) => {
  sendError(res, 404, 'NOT_FOUND', `no route ${req.method} ${req.path}`);
};

interface BodyParserError { type?: string; status?: number; expose?: boolean; limit?: number }

/** The last middleware: maps known errors to their status, everything else to 500 without details. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err: unknown, req: Request, res: Response, _next) => {
    if (err instanceof HttpError) { sendError(res, err.status, err.code, err.message, err.issues); return; }
    if (err instanceof Error && err.name === 'ArchiveIntegrityError') {
      // The plan table disagrees with the entries: no read shows (or exports) what the entries do not record.
      sendError(res, 409, 'ARCHIVE_INCONSISTENT', err.message);
      return;
    }
    if (isQueueUnavailable(err)) {
      res.set('Retry-After', String(QUEUE_RETRY_AFTER_S));
      sendError(res, 503, 'QUEUE_UNAVAILABLE', `the job queue (Redis) is not reachable; retry in ${QUEUE_RETRY_AFTER_S} s`);
      return;
    }
    const bp = (typeof err === 'object' && err !== null ? err : {}) as BodyParserError;
    if (bp.type === 'entity.too.large') {
      sendError(res, 413, 'PAYLOAD_TOO_LARGE', `request body larger than the limit of ${bp.limit ?? '?'} bytes`);
      return;
    }
    if (bp.type === 'entity.parse.failed') { sendError(res, 400, 'INVALID_JSON', 'request body is not valid JSON'); return; }
    if (bp.type === 'encoding.unsupported' || bp.type === 'charset.unsupported') {
      sendError(res, 415, 'UNSUPPORTED_ENCODING', 'unsupported body encoding or charset');
      return;
    }
    if (typeof bp.status === 'number' && bp.status >= 400 && bp.status < 500 && bp.expose) {
      sendError(res, bp.status, 'BAD_REQUEST', 'malformed request');
      return;
    }
    const requestId = String(res.locals.requestId ?? '');
    logger.error({ err, requestId, method: req.method, path: req.path }, 'unhandled error');
    sendError(res, 500, 'INTERNAL', `internal error (request id ${requestId})`);
  };
}

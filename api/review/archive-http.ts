/** Maps archive and review-rule errors to HTTP answers, and fetches the archive or answers 503 without one. */
import type { Response } from 'express';
import type { PlanArchive } from '../../archive/index.ts';
import type { AppDeps } from '../deps.ts';
import { HttpError } from '../errors.ts';
import { ReviewRuleError } from './review-rules.ts';

/** The archive, or a 503 HttpError when the service runs without one (PLAN_SINK=job-result). */
export function archiveOf(deps: Pick<AppDeps, 'archive'>): PlanArchive {
  if (!deps.archive) throw new HttpError(503, 'ARCHIVE_UNAVAILABLE', 'this service runs without the plan archive; reviews and history need it');
  return deps.archive;
}

/**
 * Answers a known error and returns true; returns false for anything else (left to the error handler).
 * ArchiveNotFoundError → 404, ArchiveConflictError and ArchiveIntegrityError → 409, ArchiveInputError → 400, ReviewRuleError → its status
 * with `missing` / `unknown` caveat codes when they apply.
 */
export function sendArchiveError(res: Response, error: unknown): boolean {
  if (error instanceof ReviewRuleError) {
    const issues = error.code === 'COMMENT_REQUIRED' ? [{ path: 'body.comment', message: error.message }]
      : error.code === 'CAVEATS_NOT_ACKNOWLEDGED' ? [{ path: 'body.acknowledgedCaveatCodes', message: error.message }] : undefined;
    res.status(error.status).json({ error: { code: error.code, message: error.message, ...(issues ? { issues } : {}), ...error.details } });
    return true;
  }
  const named = error as { name?: string; message?: string; field?: string; currentState?: string };
  switch (named?.name) {
    case 'ArchiveNotFoundError':
      res.status(404).json({ error: { code: 'PLAN_NOT_FOUND', message: named.message } });
      return true;
    case 'ArchiveConflictError':
      res.status(409).json({ error: { code: 'PLAN_ALREADY_DECIDED', message: named.message, currentState: named.currentState } });
      return true;
    case 'ArchiveIntegrityError':
      res.status(409).json({ error: { code: 'ARCHIVE_INCONSISTENT', message: named.message } });
      return true;
    case 'ArchiveInputError':
      res.status(400).json({ error: { code: 'INVALID_REQUEST', message: named.message, issues: [{ path: `body.${named.field}`, message: named.message }] } });
      return true;
    default:
      return false;
  }
}

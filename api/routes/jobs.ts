/**
 * Retargeting jobs: submit (202 new / 200 same idempotency key and request / 409 same key, other request),
 * list, status, cancel.
 */
import type { Request, Response } from 'express';
import * as z from 'zod';
import {
  checkEphemerisSetCovers, findProblemIssue, recordRemovedJob, type JobRequest, type ProblemIssue, type SubmitOutcome,
} from '../../queue/index.ts';
import { InvalidInputError, OutOfSpanError } from '../../contract/errors.ts';
import { identityOf } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { HttpError, sendAdmissionRefusal, sendError } from '../errors.ts';
import type { ApiRoutes } from '../route-table.ts';
import {
  anyJobStatusSchema, cancelBodySchema, idempotencyKeySchema, jobListQuerySchema, jobParamsSchema, jobRequestSchema, jobStatusSchema,
  submitResponseSchema,
} from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';

const READERS = ['submitter', 'reviewer', 'auditor'] as const;

/** The submission with the `Idempotency-Key` header (when sent) as its key: checked with the body field's
 * schema, and refused when the body names a different key. */
export function withHeaderKey<T extends { idempotencyKey?: string }>(body: T, headerKey: string | undefined): T {
  const request = { ...body };
  if (headerKey === undefined) return request;
  const parsed = idempotencyKeySchema.safeParse(headerKey);
  if (!parsed.success) {
    throw new HttpError(400, 'INVALID_REQUEST', 'invalid Idempotency-Key header', [{ path: 'headers.idempotency-key', message: parsed.error.issues[0]?.message ?? 'invalid' }]);
  }
  if (request.idempotencyKey && request.idempotencyKey !== parsed.data) {
    throw new HttpError(400, 'INVALID_REQUEST', 'Idempotency-Key header and body idempotencyKey differ', [{ path: 'body.idempotencyKey', message: 'differs from the Idempotency-Key header' }]);
  }
  request.idempotencyKey = parsed.data;
  return request;
}

/** The issue of a problem (already checked) naming an ephemeris set this service does not have, or one whose
 * files do not cover the span of a body the plan takes from them; or null. */
export function ephemerisSetIssue(deps: AppDeps, problem: JobRequest['problem']): ProblemIssue | null {
  try {
    checkEphemerisSetCovers(deps.ephemerisSets, problem, deps.queue.leapSeconds);
    return null;
  } catch (error) {
    if (!(error instanceof InvalidInputError || error instanceof OutOfSpanError)) throw error;
    return { field: error.field, message: error.detail };
  }
}

export function jobRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'post', path: '/v1/jobs', tags: ['jobs'], roles: ['submitter'],
    summary: 'Submit a retargeting job',
    description: 'Validates the problem (schema, then semantic checks), enqueues it and answers 202 with the job id. '
      + 'With an idempotency key (body `idempotencyKey` or header `Idempotency-Key`): the same key and the same request '
      + 'answer 200 with the existing job; the same key with a different request answers 409. Keys are per submitter.',
    body: jobRequestSchema,
    responses: SUBMIT_RESPONSES,
  }, async (req: Request, res: Response) => {
    const request = withHeaderKey(validOf<unknown, unknown, JobRequest>(res).body, req.get('idempotency-key'));
    await submitQueuedJob(deps, req, res, {
      kind: 'retarget', issueRoot: 'body.problem', urlRoot: '/v1/jobs',
      issue: findProblemIssue(request.problem, deps.queue.leapSeconds) ?? ephemerisSetIssue(deps, request.problem),
      submit: (submittedBy) => deps.queue.submit(request, submittedBy),
    });
  });

  routes.add({
    method: 'get', path: '/v1/jobs', tags: ['jobs'], roles: [...READERS],
    summary: 'List recent jobs of both kinds (retargeting and Δv budget; `kind` tells them apart)', query: jobListQuerySchema,
    responses: { 200: { description: 'Jobs, newest first', schema: z.object({ jobs: z.array(anyJobStatusSchema) }) } },
  }, async (_req, res) => {
    const q = validOf<unknown, z.infer<typeof jobListQuerySchema>, unknown>(res).query;
    const states = q.state === 'waiting' ? ['waiting', 'prioritized'] as const : q.state ? [q.state] as const
      : ['waiting', 'prioritized', 'delayed', 'active', 'waiting-children', 'completed', 'failed'] as const;
    res.json({ jobs: await deps.queue.list([...states], q.offset, q.offset + q.limit - 1) });
  });

  routes.add({
    method: 'get', path: '/v1/jobs/:jobId', tags: ['jobs'], roles: [...READERS],
    summary: 'Status and progress of a job', params: jobParamsSchema,
    responses: { 200: { description: 'Job status', schema: jobStatusSchema }, 404: { description: 'No such job' } },
  }, async (_req, res) => {
    const { jobId } = validOf<z.infer<typeof jobParamsSchema>, unknown, unknown>(res).params;
    const status = await deps.queue.status(jobId);
    if (!status) { sendError(res, 404, 'JOB_NOT_FOUND', `no job ${jobId}`); return; }
    res.json(status);
  });

  routes.add({
    method: 'post', path: '/v1/jobs/:jobId/cancel', tags: ['jobs'], roles: ['submitter', 'admin'],
    summary: 'Cancel a job',
    description: 'A waiting job is removed at once (200, state cancelled). A running one is told to stop (202); it ends '
      + 'in state cancelled. A finished job answers 409. Submitters may cancel only their own jobs; admins any.',
    params: jobParamsSchema, body: cancelBodySchema,
    responses: {
      200: { description: 'Cancelled', schema: jobStatusSchema },
      202: { description: 'Cancellation requested; the job stops shortly', schema: jobStatusSchema },
      404: { description: 'No such job' },
      409: { description: 'The job already finished' },
    },
  }, async (req, res) => cancelQueuedJob(deps, req, res, (jobId) => deps.queue.status(jobId)));
}

/** The answers of a submit route (either job kind). */
export const SUBMIT_RESPONSES = {
  202: { description: 'Job created', schema: submitResponseSchema },
  200: { description: 'Same idempotency key and request: the existing job', schema: submitResponseSchema },
  409: { description: 'Idempotency key already used for a different request' },
};

/**
 * The submit door shared by retargeting and budget jobs, after the body schema: a relation-check `issue`
 * answers 400 naming the field under `issueRoot`; else the job is enqueued (`submit`): 202 created or 200 the
 * existing job (same idempotency key and request) with its status and event URLs under `urlRoot`, 409 for a
 * key reused for other work, 429/503 when admission refuses. No archive write here: better-sqlite3 writes are
 * synchronous and would stall every request; the worker records the submission when it starts the job
 * (idempotent by job id), the cancel route when it never runs.
 */
export async function submitQueuedJob(deps: AppDeps, req: Request, res: Response, spec: {
  kind: 'retarget' | 'delta-v-budget'; issue: ProblemIssue | null; issueRoot: string; urlRoot: string;
  submit: (submittedBy: string) => Promise<SubmitOutcome>;
}): Promise<void> {
  const { issue, kind } = spec;
  if (issue) {
    deps.metrics.submissions.inc({ kind, outcome: 'invalid' });
    throw new HttpError(400, 'INVALID_PROBLEM', issue.message, [{ path: `${spec.issueRoot}.${issue.field}`.replace(/\.\[/g, '['), message: issue.message }]);
  }
  const outcome = await spec.submit(identityOf(req).name);
  deps.metrics.submissions.inc({ kind, outcome: outcome.outcome });
  if (outcome.outcome === 'queue-full' || outcome.outcome === 'submitter-full') { sendAdmissionRefusal(res, outcome); return; }
  if (outcome.outcome === 'conflict') {
    sendError(res, 409, 'IDEMPOTENCY_CONFLICT', `idempotency key already used for a different request (job ${outcome.jobId})`);
    return;
  }
  const statusUrl = `${spec.urlRoot}/${outcome.jobId}`;
  const body = { jobId: outcome.jobId, outcome: outcome.outcome, statusUrl, eventsUrl: `${statusUrl}/events` };
  res.status(outcome.outcome === 'created' ? 202 : 200).location(statusUrl).json(body);
}

/**
 * The cancel door shared by retargeting and budget jobs: `statusOf` reads the job of that kind. A waiting job
 * is removed (200) and, since no worker recorded it, its submission and cancellation are archived (recordRemovedJob); a
 * running one is told to stop (202); a finished one answers 409. Submitters cancel only their own jobs.
 */
export async function cancelQueuedJob(deps: AppDeps, req: Request, res: Response, statusOf: (jobId: string) => Promise<{ submittedBy: string } | undefined>): Promise<void> {
  const { params, body } = validOf<z.infer<typeof jobParamsSchema>, unknown, z.infer<typeof cancelBodySchema>>(res);
  const identity = identityOf(req);
  const before = await statusOf(params.jobId);
  if (!before) { sendError(res, 404, 'JOB_NOT_FOUND', `no job ${params.jobId}`); return; }
  if (!identity.roles.includes('admin') && before.submittedBy !== identity.name) {
    sendError(res, 403, 'FORBIDDEN', 'submitters may cancel only their own jobs');
    return;
  }
  const outcome = await deps.queue.cancel(params.jobId, identity.name, body.reason);
  if (outcome.outcome === 'not-found') { sendError(res, 404, 'JOB_NOT_FOUND', `no job ${params.jobId}`); return; }
  if (outcome.outcome === 'already-finished') {
    sendError(res, 409, 'JOB_FINISHED', `job ${params.jobId} already finished (${outcome.state})`);
    return;
  }
  if (outcome.outcome === 'cancelled' && deps.archive) {
    // The job never ran, so no worker recorded it: its submission and cancellation are recorded here.
    await recordRemovedJob(deps.archive, params.jobId, outcome.removed, identity.name, body.reason)
      .catch((err: unknown) => deps.logger.error({ err, jobId: params.jobId }, 'archive: job-cancelled not recorded'));
  }
  const after = await statusOf(params.jobId);
  res.status(outcome.outcome === 'cancelled' ? 200 : 202).json(after ?? before);
}

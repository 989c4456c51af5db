/**
 * Δv budget studies: submit (202 new / 200 same idempotency key and request / 409 same key, other request),
 * status with progress, the finished study, cancel. A budget job runs beside retargeting jobs on the same
 * workers (its non-linear samples fanned out as child jobs); its result is a study, never a plan to approve.
 */
import type { Request, Response } from 'express';
import { z } from 'zod';
import { budgetJobRequestSchema, findBudgetIssue, type BudgetJobRequest } from '../../queue/index.ts';
import { identityOf } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { HttpError, sendAdmissionRefusal, sendError } from '../errors.ts';
import type { ApiRoutes } from '../route-table.ts';
import { cancelBodySchema, jobParamsSchema, submitResponseSchema } from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';
import { cancelQueuedJob } from './jobs.ts';

const READERS = ['submitter', 'reviewer', 'auditor'] as const;

export function budgetRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'post', path: '/v1/budgets', tags: ['budgets'], roles: ['submitter'],
    summary: 'Submit a Δv budget study',
    description: 'Validates the budget request (schema, the problem\'s semantic checks, one knowledge covariance per burn), '
      + 'enqueues it and answers 202 with the job id. The non-linear samples fan out over the workers. The result is a '
      + 'study: never a plan, never approvable. Idempotency keys work as for retargeting jobs.',
    body: budgetJobRequestSchema,
    responses: {
      202: { description: 'Budget job created', schema: submitResponseSchema },
      200: { description: 'Same idempotency key and request: the existing job', schema: submitResponseSchema },
      409: { description: 'Idempotency key already used for a different request' },
    },
  }, async (req: Request, res: Response) => {
    const request = validOf<unknown, unknown, BudgetJobRequest>(res).body;
    const set = request.request.problem.forceModel.ephemerisSet;
    const issue = findBudgetIssue(request.request, deps.queue.leapSeconds) ?? (set === undefined ? null : {
      field: 'problem.forceModel.ephemerisSet', message: `a Δv budget is studied on the built-in series only; remove the ephemeris set '${set}'`,
    });
    if (issue) {
      deps.metrics.submissions.inc({ kind: 'delta-v-budget', outcome: 'invalid' });
      throw new HttpError(400, 'INVALID_PROBLEM', issue.message, [{ path: `body.request.${issue.field}`.replace(/\.\[/g, '['), message: issue.message }]);
    }
    const outcome = await deps.queue.submitBudget(request, identityOf(req).name);
    deps.metrics.submissions.inc({ kind: 'delta-v-budget', outcome: outcome.outcome });
    if (outcome.outcome === 'queue-full' || outcome.outcome === 'submitter-full') { sendAdmissionRefusal(res, outcome); return; }
    if (outcome.outcome === 'conflict') {
      sendError(res, 409, 'IDEMPOTENCY_CONFLICT', `idempotency key already used for a different request (job ${outcome.jobId})`);
      return;
    }
    const body = { jobId: outcome.jobId, outcome: outcome.outcome, statusUrl: `/v1/budgets/${outcome.jobId}`, eventsUrl: `/v1/budgets/${outcome.jobId}/events` };
    res.status(outcome.outcome === 'created' ? 202 : 200).location(body.statusUrl).json(body);
  });

  routes.add({
    method: 'get', path: '/v1/budgets/:jobId', tags: ['budgets'], roles: [...READERS],
    summary: 'Status and progress of a budget job', params: jobParamsSchema,
    responses: { 200: { description: 'Budget job status', schema: z.record(z.string(), z.unknown()) }, 404: { description: 'No such budget job' } },
  }, async (_req, res) => {
    const { jobId } = validOf<z.infer<typeof jobParamsSchema>, unknown, unknown>(res).params;
    const status = await deps.queue.budgetStatus(jobId);
    if (!status) { sendError(res, 404, 'JOB_NOT_FOUND', `no budget job ${jobId}`); return; }
    res.json(status);
  });

  routes.add({
    method: 'get', path: '/v1/budgets/:jobId/study', tags: ['budgets'], roles: [...READERS],
    summary: 'The finished budget study (with its caveats)', params: jobParamsSchema,
    responses: {
      200: { description: 'The study, as archived (or from the job result without an archive)', schema: z.record(z.string(), z.unknown()) },
      404: { description: 'No such budget job, or no study (yet)' },
    },
  }, async (_req, res) => {
    const { jobId } = validOf<z.infer<typeof jobParamsSchema>, unknown, unknown>(res).params;
    const archived = deps.archive ? await deps.archive.getStudyByJob(jobId) : undefined;
    if (archived) {
      res.json({ studyId: jobId, storedIn: 'archive', archivedAt: archived.at, sequence: archived.sequence, studyHash: archived.studyHash, study: archived.study });
      return;
    }
    const result = await deps.queue.budgetResult(jobId);
    if (!result?.result) { sendError(res, 404, 'STUDY_NOT_FOUND', `no finished budget study for job ${jobId}`); return; }
    res.json({ studyId: jobId, storedIn: result.storedIn, study: result.result });
  });

  routes.add({
    method: 'post', path: '/v1/budgets/:jobId/cancel', tags: ['budgets'], roles: ['submitter', 'admin'],
    summary: 'Cancel a budget job (and its running sample batches)',
    params: jobParamsSchema, body: cancelBodySchema,
    responses: {
      200: { description: 'Cancelled', schema: z.record(z.string(), z.unknown()) },
      202: { description: 'Cancellation requested', schema: z.record(z.string(), z.unknown()) },
      404: { description: 'No such budget job' },
      409: { description: 'The job already finished' },
    },
  }, async (req, res) => cancelQueuedJob(deps, req, res, (jobId) => deps.queue.budgetStatus(jobId)));
}

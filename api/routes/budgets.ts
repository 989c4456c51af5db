/**
 * Δv budget studies: submit (202 new / 200 same idempotency key and request / 409 same key, other request),
 * status with progress, the finished study, cancel. A budget job runs beside retargeting jobs on the same
 * workers (its non-linear samples fanned out as child jobs); its result is a study, never a plan to approve.
 */
import type { Request, Response } from 'express';
import * as z from 'zod';
import { budgetJobRequestSchema, findBudgetIssue, type BudgetJobRequest, type ProblemIssue } from '../../queue/index.ts';
import type { AppDeps } from '../deps.ts';
import { sendError } from '../errors.ts';
import type { ApiRoutes } from '../route-table.ts';
import { cancelBodySchema, jobParamsSchema } from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';
import { cancelQueuedJob, ephemerisSetIssue, SUBMIT_RESPONSES, submitQueuedJob, withHeaderKey } from './jobs.ts';

const READERS = ['submitter', 'reviewer', 'auditor'] as const;

export function budgetRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'post', path: '/v1/budgets', tags: ['budgets'], roles: ['submitter'],
    summary: 'Submit a Δv budget study',
    description: 'Validates the budget request (schema, the problem\'s semantic checks, one knowledge covariance per burn), '
      + 'enqueues it and answers 202 with the job id. The non-linear samples fan out over the workers. The result is a '
      + 'study: never a plan, never approvable. Idempotency keys (body field or Idempotency-Key header) work as for retargeting jobs.',
    body: budgetJobRequestSchema,
    responses: SUBMIT_RESPONSES,
  }, async (req: Request, res: Response) => {
    const request = withHeaderKey(validOf<unknown, unknown, BudgetJobRequest>(res).body, req.get('idempotency-key'));
    const setIssue = (): ProblemIssue | null => {
      const found = ephemerisSetIssue(deps, request.request.problem);
      return found && { ...found, field: `problem.${found.field}` };
    };
    const issue = findBudgetIssue(request.request, deps.queue.leapSeconds) ?? setIssue();
    await submitQueuedJob(deps, req, res, {
      kind: 'delta-v-budget', issue, issueRoot: 'body.request', urlRoot: '/v1/budgets',
      submit: (submittedBy) => deps.queue.submitBudget(request, submittedBy),
    });
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

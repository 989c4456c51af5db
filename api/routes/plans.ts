/** Plans: fetch one (with the review notice), list with filters. */
import * as z from 'zod';
import type { AppDeps } from '../deps.ts';
import { sendError } from '../errors.ts';
import type { ApiRoutes } from '../route-table.ts';
import { REVIEW_NOTICE, planListQuerySchema, planParamsSchema, planResponseSchema, planSummarySchema } from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';

const READERS = ['submitter', 'reviewer', 'auditor'] as const;

export function planRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/plans', tags: ['plans'], roles: [...READERS],
    summary: 'List plans with filters (state, spacecraft, proposed-at range [from, to), converged)',
    query: planListQuerySchema,
    responses: { 200: { description: 'Plans, newest first', schema: z.object({ plans: z.array(planSummarySchema), notice: z.string() }) } },
  }, async (_req, res) => {
    const q = validOf<unknown, z.infer<typeof planListQuerySchema>, unknown>(res).query;
    const plans = await deps.plans.list({
      limit: q.limit, offset: q.offset,
      ...(q.state ? { state: q.state } : {}), ...(q.spacecraft ? { spacecraftName: q.spacecraft } : {}),
      ...(q.from ? { from: q.from } : {}), ...(q.to ? { to: q.to } : {}),
      ...(q.converged !== undefined ? { converged: q.converged } : {}),
    });
    res.json({ plans, notice: REVIEW_NOTICE });
  });

  routes.add({
    method: 'get', path: '/v1/plans/:planId', tags: ['plans'], roles: [...READERS],
    summary: 'Fetch a plan (the full proposed plan document)', params: planParamsSchema,
    responses: { 200: { description: 'The plan', schema: planResponseSchema }, 404: { description: 'No such plan' } },
  }, async (_req, res) => {
    const { planId } = validOf<z.infer<typeof planParamsSchema>, unknown, unknown>(res).params;
    const found = await deps.plans.get(planId);
    if (!found) { sendError(res, 404, 'PLAN_NOT_FOUND', `no plan ${planId}`); return; }
    res.json({ ...found, notice: REVIEW_NOTICE });
  });
}

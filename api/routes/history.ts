/** A plan's full history (its entries and its job's, each with its hash re-checked), and raw chain pages for auditors. */
import type { Response } from 'express';
import * as z from 'zod';
import { entryHash, type ArchiveEntry } from '../../archive/index.ts';
import type { AppDeps } from '../deps.ts';
import { archiveOf } from '../review/archive-http.ts';
import { entriesQuerySchema, entrySchema, historyResponseSchema } from '../../contract/review-schemas.ts';
import type { ApiRoutes } from '../route-table.ts';
import { planParamsSchema, REVIEW_NOTICE } from '../../contract/http-schemas.ts';
import { sendError } from '../errors.ts';
import { validOf } from '../validate.ts';

function hashMatches(entry: ArchiveEntry): boolean {
  try { return entryHash(entry) === entry.hash; } catch { return false; }
}

export function historyRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/plans/:planId/history', tags: ['history'], roles: ['submitter', 'reviewer', 'auditor'],
    summary: "A plan's full history: every archive entry about it and its job, oldest first",
    description: 'Each entry carries `hashMatches` (its content re-hashed here). The link between entries of other plans '
      + 'is checked by /v1/archive/verify (whole chain) or offline from /v1/plans/{planId}/export.',
    params: planParamsSchema,
    responses: { 200: { description: 'The plan record and its entries', schema: historyResponseSchema }, 404: { description: 'No such plan' } },
  }, async (_req, res: Response) => {
    const archive = archiveOf(deps);
    const { planId } = validOf<z.infer<typeof planParamsSchema>, unknown, unknown>(res).params;
    const plan = await archive.getPlan(planId);
    if (!plan) { sendError(res, 404, 'PLAN_NOT_FOUND', `no plan ${planId}`); return; }
    const entries = (await archive.history(planId)).map((e) => ({ ...e, hashMatches: hashMatches(e) }));
    res.json({ plan, entries, notice: REVIEW_NOTICE });
  });

  routes.add({
    method: 'get', path: '/v1/archive/entries', tags: ['history'], roles: ['auditor'],
    summary: 'Raw archive entries in sequence order (for checking the chain independently)',
    query: entriesQuerySchema,
    responses: { 200: { description: 'A page of entries', schema: z.object({ entries: z.array(entrySchema), head: z.object({ sequence: z.number(), hash: z.string() }) }) } },
  }, async (_req, res: Response) => {
    const archive = archiveOf(deps);
    const { from, limit } = validOf<unknown, z.infer<typeof entriesQuerySchema>, unknown>(res).query;
    res.json({ entries: await archive.entries(from, limit), head: await archive.head() });
  });
}

/** Export of a plan bundle: the plan, its entries and the chain headers needed to check them offline. */
import type { Request, Response } from 'express';
import * as z from 'zod';
import { buildPlanBundle } from '../../archive/index.ts';
import { identityOf } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { archiveOf, sendArchiveError } from '../review/archive-http.ts';
import { exportQuerySchema } from '../../contract/review-schemas.ts';
import type { ApiRoutes } from '../route-table.ts';
import { planParamsSchema, REVIEW_NOTICE } from '../../contract/http-schemas.ts';
import { validOf } from '../validate.ts';

export function exportRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/plans/:planId/export', tags: ['history'], roles: ['reviewer', 'auditor'],
    summary: 'Export a plan bundle (JSON): plan, entries, chain headers, hashing rules',
    description: 'The bundle can be checked offline with `veer verify --bundle <file>`. With `toHead=true` the chain headers '
      + 'run up to the archive head at export time, tying the plan to the current head hash.',
    params: planParamsSchema,
    query: exportQuerySchema,
    responses: { 200: { description: 'The bundle (veer-plan-bundle, version 1)', schema: z.record(z.string(), z.unknown()) }, 404: { description: 'No such plan' } },
  }, async (req: Request, res: Response) => {
    const archive = archiveOf(deps);
    const { params, query } = validOf<z.infer<typeof planParamsSchema>, z.infer<typeof exportQuerySchema>, unknown>(res);
    try {
      const bundle = await buildPlanBundle(archive, params.planId, { notice: REVIEW_NOTICE, exportedBy: identityOf(req).name, toHead: query.toHead });
      res.set('Content-Disposition', `attachment; filename="${params.planId}-bundle.json"`);
      res.json(bundle);
    } catch (error) {
      if (!sendArchiveError(res, error)) throw error;
    }
  });
}

/** Verification of the whole archive chain (auditor role). */
import type { Request, Response } from 'express';
import { identityOf } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { archiveOf } from '../review/archive-http.ts';
import { verifyResponseSchema } from '../../contract/review-schemas.ts';
import type { ApiRoutes } from '../route-table.ts';

export function verifyRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/archive/verify', tags: ['history'], roles: ['auditor'],
    summary: 'Walk the whole hash chain and name the first entry that does not match',
    description: 'Also re-derives every plan state from the entries and reports projection rows that differ. '
      + 'Answers 200 either way; `ok` tells the result.',
    responses: { 200: { description: 'Verification report', schema: verifyResponseSchema } },
  }, async (req: Request, res: Response) => {
    const report = await archiveOf(deps).verify();
    res.json({ ...report, verifiedBy: identityOf(req).name, verifiedAt: new Date().toISOString() });
  });
}

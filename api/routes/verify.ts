/** Verification of the whole archive chain (auditor role). */
import type { Request, Response } from 'express';
import type * as z from 'zod';
import { identityOf } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { archiveOf } from '../review/archive-http.ts';
import { verifyQuerySchema, verifyResponseSchema } from '../../contract/review-schemas.ts';
import type { ApiRoutes } from '../route-table.ts';
import { validOf } from '../validate.ts';

export function verifyRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/archive/verify', tags: ['history'], roles: ['auditor'],
    summary: 'Walk the whole hash chain and name the first entry that does not match',
    description: 'Also re-derives every plan state from the entries and reports projection rows that differ. '
      + 'With `expectHead=SEQ:HASH` (a head recorded earlier, outside the database) the entry SEQ must still be in the '
      + 'chain with that hash: newest entries cut and re-appended, or cut, fail. Answers 200 either way; `ok` tells the result.',
    query: verifyQuerySchema,
    responses: { 200: { description: 'Verification report', schema: verifyResponseSchema } },
  }, async (req: Request, res: Response) => {
    const { query } = validOf<unknown, z.infer<typeof verifyQuerySchema>, unknown>(res);
    const report = await archiveOf(deps).verify(query.expectHead ? { expectHead: query.expectHead } : {});
    res.json({ ...report, verifiedBy: identityOf(req).name, verifiedAt: new Date().toISOString() });
  });
}

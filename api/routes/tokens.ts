/** Token management over HTTP (admin role). The secret is returned once, on creation. */
import type { Response } from 'express';
import * as z from 'zod';
import { identityOf, newTokenSchema } from '../auth/index.ts';
import type { AppDeps } from '../deps.ts';
import { sendError } from '../errors.ts';
import { tokenParamsSchema, tokenRecordSchema } from '../../contract/review-schemas.ts';
import type { ApiRoutes } from '../route-table.ts';
import { validOf } from '../validate.ts';

export function tokenRoutes(routes: ApiRoutes, deps: AppDeps): void {
  routes.add({
    method: 'get', path: '/v1/tokens', tags: ['tokens'], roles: ['admin'],
    summary: 'List tokens (names, roles, times; never secrets or hashes)',
    responses: { 200: { description: 'Tokens', schema: z.object({ tokens: z.array(tokenRecordSchema) }) } },
  }, async (_req, res: Response) => {
    res.json({ tokens: await deps.tokens.list() });
  });

  routes.add({
    method: 'post', path: '/v1/tokens', tags: ['tokens'], roles: ['admin'],
    summary: 'Create a token; the secret is in this answer only',
    body: newTokenSchema,
    responses: { 201: { description: 'Created', schema: z.object({ token: z.string(), record: tokenRecordSchema }) } },
  }, async (req, res: Response) => {
    const body = validOf<unknown, unknown, z.infer<typeof newTokenSchema>>(res).body;
    const admin = identityOf(req).name;
    const created = await deps.tokens.add(body.name, [...new Set(body.roles)], admin);
    // The audit trail of identities: who made which token with which roles (never the secret).
    deps.logger.info({ audit: 'token-created', tokenId: created.record.id, name: created.record.name, roles: created.record.roles, by: admin },
      'token created');
    res.status(201).json(created);
  });

  routes.add({
    method: 'delete', path: '/v1/tokens/:tokenId', tags: ['tokens'], roles: ['admin'],
    summary: 'Revoke a token (it stops working at once; the record stays)',
    params: tokenParamsSchema,
    responses: { 200: { description: 'Revoked', schema: z.object({ record: tokenRecordSchema }) }, 404: { description: 'No such token' } },
  }, async (req, res: Response) => {
    const { tokenId } = validOf<z.infer<typeof tokenParamsSchema>, unknown, unknown>(res).params;
    const admin = identityOf(req).name;
    const record = await deps.tokens.revoke(tokenId, admin);
    if (!record) { sendError(res, 404, 'TOKEN_NOT_FOUND', `no token ${tokenId}`); return; }
    deps.logger.info({ audit: 'token-revoked', tokenId, name: record.name, by: admin, revokedBy: record.revokedBy }, 'token revoked');
    res.json({ record });
  });
}

/**
 * Role matrix over the whole service (createApp with every route module, real Redis, SQLite archive): every
 * route × every role × no token × a bad token. Routes that declare roles answer 401 without a valid token and
 * 403 to roles they do not list; listed roles get past the guard (whatever the route then says about the
 * deliberately unknown ids). Public routes are read-only.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ApiRoutes, ROUTE_MODULES, type AppDeps } from '../../api/index.ts';
import { ROLES, type Role } from '../../api/auth/index.ts';
import { startService, type TestService } from '../harness/service.ts';

let svc: TestService;
beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

/** The route table as createApp builds it (registration only; no handler runs). */
function routeSpecs(): ApiRoutes['specs'] {
  const routes = new ApiRoutes();
  for (const mount of ROUTE_MODULES) mount(routes, { limits: {}, metrics: {}, version: 'test' } as unknown as AppDeps);
  return routes.specs;
}

const concretePath = (path: string): string => path
  .replace(':jobId', 'no-such-job').replace(':planId', 'no-such-plan').replace(':tokenId', 'tok_000000000000').replace(':kind', 'opm');

async function call(method: string, path: string, token?: string): Promise<number> {
  const headers: Record<string, string> = { 'content-type': 'application/json' };
  if (token) headers.authorization = `Bearer ${token}`;
  const res = await fetch(svc.url + path, { method, headers, body: method === 'GET' ? undefined : '{}', signal: AbortSignal.timeout(10_000) });
  await res.body?.cancel();
  return res.status;
}

describe('role matrix over the whole service', () => {
  const byRole: Record<Role, () => string> = {
    submitter: () => svc.tokens.submitter, reviewer: () => svc.tokens.reviewer, auditor: () => svc.tokens.auditor, admin: () => svc.tokens.admin,
  };

  describe('when a route is public', () => {
    it('should only read (no anonymous writes)', () => {
      const publicWrites = routeSpecs().filter((s) => !s.roles && s.method !== 'get').map((s) => `${s.method} ${s.path}`);
      expect(publicWrites).toEqual([]);
    });
  });

  describe.each(routeSpecs().filter((s) => s.roles).map((s) => [`${s.method.toUpperCase()} ${s.path}`, s] as const))('when calling %s', (_label, spec) => {
    it('should answer 401 without a valid token, 403 to roles it does not list, and let listed roles past the guard', async () => {
      const method = spec.method.toUpperCase();
      const path = concretePath(spec.path);
      expect(await call(method, path)).toBe(401);
      expect(await call(method, path, 'veer_forged')).toBe(401);
      for (const role of ROLES) {
        const status = await call(method, path, byRole[role]());
        if (spec.roles!.includes(role)) expect([401, 403], `${method} ${path} as ${role} → ${status}`).not.toContain(status);
        else expect(status, `${method} ${path} as ${role}`).toBe(403);
      }
    });
  });
});

/**
 * Role matrix over the whole service (createApp with every route module, real Redis, SQLite archive): every
 * route × every role × no token × a bad token. Routes that declare roles answer 401 without a valid token and
 * 403 to roles they do not list; listed roles get the route's own answer to the request sent here (an empty
 * JSON body and deliberately unknown ids), stated per route below — never a 500. Public routes are read-only.
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

/**
 * What an admitted role gets for `{}` and unknown ids: 400 where the body is validated first, 404 for an unknown
 * job / plan / token, 200 for lists and checks. A new route must be added here (the coverage test fails otherwise).
 */
const ADMITTED_STATUS: Record<string, number> = {
  'post /v1/jobs': 400,
  'get /v1/jobs': 200,
  'get /v1/jobs/:jobId': 404,
  'post /v1/jobs/:jobId/cancel': 404,
  'get /v1/jobs/:jobId/events': 404,
  'get /v1/plans': 200,
  'get /v1/plans/:planId': 404,
  'post /v1/ccsds/opm/initial-state': 400,
  'get /v1/plans/:planId/ccsds/:kind': 404,
  'post /v1/plans/:planId/reviews': 400,
  'get /v1/plans/:planId/history': 404,
  'get /v1/archive/entries': 200,
  'get /v1/plans/:planId/export': 404,
  'get /v1/archive/verify': 200,
  'get /v1/tokens': 200,
  'post /v1/tokens': 400,
  'delete /v1/tokens/:tokenId': 404,
  'post /v1/budgets': 400,
  'get /v1/budgets/:jobId': 404,
  'get /v1/budgets/:jobId/study': 404,
  'post /v1/budgets/:jobId/cancel': 404,
  'get /v1/budgets/:jobId/events': 404,
  'get /v1/ephemerides': 200,
};

describe('role matrix over the whole service', () => {
  const byRole: Record<Role, () => string> = {
    submitter: () => svc.tokens.submitter, reviewer: () => svc.tokens.reviewer, auditor: () => svc.tokens.auditor, admin: () => svc.tokens.admin,
  };

  describe('when the route table is read', () => {
    it('should have an expected answer for every route that declares roles', () => {
      const declared = routeSpecs().filter((s) => s.roles).map((s) => `${s.method} ${s.path}`);
      expect(declared.sort()).toEqual(Object.keys(ADMITTED_STATUS).sort());
    });
  });

  describe('when a route is public', () => {
    it('should only read (no anonymous writes)', () => {
      const publicWrites = routeSpecs().filter((s) => !s.roles && s.method !== 'get').map((s) => `${s.method} ${s.path}`);
      expect(publicWrites).toEqual([]);
    });
  });

  describe.each(routeSpecs().filter((s) => s.roles).map((s) => [`${s.method.toUpperCase()} ${s.path}`, s] as const))('when calling %s', (_label, spec) => {
    it('should answer 401 without a valid token, 403 to roles it does not list, and its own answer to listed roles', async () => {
      const method = spec.method.toUpperCase();
      const path = concretePath(spec.path);
      expect(await call(method, path)).toBe(401);
      expect(await call(method, path, 'veer_forged')).toBe(401);
      for (const role of ROLES) {
        const status = await call(method, path, byRole[role]());
        if (spec.roles!.includes(role)) expect(status, `${method} ${path} as ${role}`).toBe(ADMITTED_STATUS[`${spec.method} ${spec.path}`]);
        else expect(status, `${method} ${path} as ${role}`).toBe(403);
      }
    });
  });
});

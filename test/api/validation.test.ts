/**
 * The HTTP API's door: zod validation with field paths, authentication and roles, sizes, rate limits,
 * unknown routes, helmet headers, and never a stack trace. Real Redis (harness), real SQLite stores.
 * Status codes follow RFC 9110 (400, 401, 403, 404, 409, 413) and RFC 6585 (429).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, type TestService } from '../harness/service.ts';
import { schemaValidProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;

beforeAll(async () => {
  svc = await startService({ apiEnv: { RATE_LIMIT_MAX: '40', RATE_LIMIT_WINDOW_S: '60', BODY_LIMIT_KB: '16' } });
});
afterAll(async () => { await svc?.close(); });

describe('job submission validation', () => {
  describe('when fields are wrong in several places', () => {
    it('should answer 400 listing every failing field path', async () => {
      const problem = schemaValidProblem();
      problem.spacecraft.massKg = -5;
      problem.burns[0].epoch = 42;
      delete problem.initialState.velocityKmS;
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem, { priority: 'soon' }) });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('INVALID_REQUEST');
      const paths = res.body.error.issues.map((i: { path: string }) => i.path);
      expect(paths).toEqual(expect.arrayContaining([
        'body.problem.spacecraft.massKg', 'body.problem.burns[0].epoch', 'body.problem.initialState.velocityKmS', 'body.priority',
      ]));
    });
  });

  describe('when the problem passes the schema but fails a semantic check', () => {
    it('should answer 400 naming the field inside the problem', async () => {
      const problem = schemaValidProblem();
      problem.endEpoch = '2031-02-01T00:00:00 TDB';
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('INVALID_PROBLEM');
      expect(res.body.error.issues[0].path).toBe('body.problem.endEpoch');
    });
  });

  describe('when the body is not JSON', () => {
    it('should answer 400 INVALID_JSON without a stack trace', async () => {
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, rawBody: '{"problem": ' });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('INVALID_JSON');
      expect(res.text).not.toMatch(/at .*\.(ts|js):\d+/);
    });
  });

  describe('when the body is over the size limit', () => {
    it('should answer 413', async () => {
      const res = await svc.request('POST', '/v1/jobs', {
        token: svc.tokens.submitter, body: submission(schemaValidProblem(), { reason: 'x'.repeat(20 * 1024) }),
      });
      expect(res.status).toBe(413);
      expect(res.body.error.code).toBe('PAYLOAD_TOO_LARGE');
    });
  });

  describe('when a query or path parameter is invalid', () => {
    it('should answer 400 with query and params paths', async () => {
      const list = await svc.request('GET', '/v1/plans?converged=maybe&limit=0', { token: svc.tokens.reviewer });
      expect(list.status).toBe(400);
      expect(list.body.error.issues.map((i: { path: string }) => i.path)).toEqual(expect.arrayContaining(['query.converged', 'query.limit']));
      const job = await svc.request('GET', `/v1/jobs/${encodeURIComponent('bad id!')}`, { token: svc.tokens.reviewer });
      expect(job.status).toBe(400);
      expect(job.body.error.issues[0].path).toBe('params.jobId');
    });
  });
});

describe('authentication and roles', () => {
  describe('when no token is given', () => {
    it('should answer 401', async () => {
      const res = await svc.request('POST', '/v1/jobs', { body: submission(schemaValidProblem()) });
      expect(res.status).toBe(401);
    });
  });
  describe('when the token is unknown', () => {
    it('should answer 401', async () => {
      const res = await svc.request('GET', '/v1/jobs', { token: 'not-a-real-token' });
      expect(res.status).toBe(401);
    });
  });
  describe('when the role does not allow the route', () => {
    it('should answer 403 for a reviewer submitting a job', async () => {
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.reviewer, body: submission(schemaValidProblem()) });
      expect(res.status).toBe(403);
    });
  });
});

describe('unknown things', () => {
  describe('when the job or plan does not exist', () => {
    it('should answer 404 JSON', async () => {
      expect((await svc.request('GET', '/v1/jobs/j-nope', { token: svc.tokens.reviewer })).status).toBe(404);
      expect((await svc.request('GET', '/v1/plans/p-nope', { token: svc.tokens.reviewer })).status).toBe(404);
      const route = await svc.request('GET', '/v1/nothing-here', { token: svc.tokens.reviewer });
      expect(route.status).toBe(404);
      expect(route.body.error.code).toBe('NOT_FOUND');
    });
  });
});

describe('security headers', () => {
  describe('when any route answers', () => {
    it('should carry helmet headers and no X-Powered-By', async () => {
      const res = await svc.request('GET', '/health');
      expect(res.status).toBe(200);
      expect(res.headers.get('x-content-type-options')).toBe('nosniff');
      expect(res.headers.get('content-security-policy')).toMatch(/default-src/);
      expect(res.headers.get('x-powered-by')).toBeNull();
    });
  });
});

describe('rate limiting per token', () => {
  describe('when one token exceeds the limit', () => {
    it('should answer 429 to that token while another token still gets through', async () => {
      let last = 0;
      for (let i = 0; i < 45; i++) last = (await svc.request('GET', '/v1/jobs?limit=1', { token: svc.tokens.auditor })).status;
      expect(last).toBe(429);
      const other = await svc.request('GET', '/v1/jobs?limit=1', { token: svc.tokens.admin });
      expect(other.status).toBe(403);
      const res = await svc.request('GET', '/v1/jobs?limit=1', { token: svc.tokens.auditor });
      expect(res.body.error.code).toBe('RATE_LIMITED');
    });
  });
});

describe('rate limiting of refused tokens', () => {
  describe('when one address keeps presenting unknown tokens', () => {
    it('should answer 429 once the per-address limit is used up, before any token lookup', async () => {
      // A service of its own (same Redis): AUTH_FAILURE_LIMIT_MAX=5 per 60 s window.
      const own = await startService({ redis: svc.redis, apiEnv: { AUTH_FAILURE_LIMIT_MAX: '5', RATE_LIMIT_WINDOW_S: '60' } });
      try {
        const anonymous = await own.request('GET', '/health');
        expect(anonymous.status).toBe(200);
        // Accepted tokens never count, however many of their requests are in flight at once (4 × the limit).
        const burst = await Promise.all(Array.from({ length: 20 }, () => own.request('GET', '/v1/jobs?limit=1', { token: own.tokens.auditor })));
        expect(burst.map((r) => r.status)).toEqual(Array(20).fill(200));
        // Nor do answers the client cut short (6 event streams of a waiting job, closed by the client).
        const job = await own.request('POST', '/v1/jobs', { token: own.tokens.submitter, body: submission(schemaValidProblem()) });
        expect(job.status).toBe(202);
        for (let i = 0; i < 6; i++) {
          const controller = new AbortController();
          const stream = await fetch(`${own.url}/v1/jobs/${job.body.jobId}/events`, { headers: { authorization: `Bearer ${own.tokens.auditor}` }, signal: controller.signal });
          expect(stream.status).toBe(200);
          controller.abort();
        }
        await new Promise((r) => setTimeout(r, 300)); // the server sees the closed connections
        expect((await own.request('GET', '/v1/jobs?limit=1', { token: own.tokens.auditor })).status).toBe(200);
        const statuses: number[] = [];
        for (let i = 0; i < 5; i++) statuses.push((await own.request('GET', '/v1/jobs?limit=1', { token: `veer_guess-${i}` })).status);
        expect(statuses).toEqual([401, 401, 401, 401, 401]);
        const sixth = await own.request('GET', '/v1/jobs?limit=1', { token: 'veer_guess-6' });
        expect(sixth.status).toBe(429);
        expect(sixth.body.error.code).toBe('TOO_MANY_REFUSED_TOKENS');
        expect(Number(sixth.headers.get('retry-after'))).toBeGreaterThan(0);
        // Requests without a token are not counted by this limiter (the per-token limit covers them).
        expect((await own.request('GET', '/health')).status).toBe(200);
        // Past the limit the address is refused for the rest of the window, whatever token it shows.
        expect((await own.request('GET', '/v1/jobs?limit=1', { token: own.tokens.auditor })).status).toBe(429);
      } finally {
        await own.close();
      }
    });
  });
});

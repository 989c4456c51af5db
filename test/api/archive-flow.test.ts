/**
 * The full path over HTTP with the real service (API + in-process worker + real Redis + planner):
 * submit → the worker proposes the plan into the archive → two-person rule → approval acknowledging the plan's
 * caveats → history → export bundle checked offline → chain verified by an auditor. Runs on the SQLite store
 * and on PostgreSQL (DATABASE_URL pointed at a fresh database from test/harness/postgres.ts).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { checkPlanBundle } from '../../archive/index.ts';
import { startPostgres, type TestPostgres } from '../harness/postgres.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';

let pgServer: TestPostgres;
beforeAll(async () => { pgServer = await startPostgres(); });
afterAll(async () => { await pgServer?.stop(); });

describe.each(['SQLite', 'PostgreSQL'])('submit → propose → review → verify on %s', (store) => {
  let svc: TestService;
  const savedUrl = process.env.DATABASE_URL;

  beforeAll(async () => {
    if (store === 'PostgreSQL') process.env.DATABASE_URL = await pgServer.freshDatabase();
    else delete process.env.DATABASE_URL;
    svc = await startService();
    await svc.startWorkerInProcess({ concurrency: 1 });
  });
  afterAll(async () => {
    await svc?.close();
    if (savedUrl === undefined) delete process.env.DATABASE_URL; else process.env.DATABASE_URL = savedUrl;
  });

  describe('when a submitted job yields a plan', () => {
    it('should be archived, refused to its submitter, approved by another reviewer, and verify', async () => {
      expect(svc.archive?.storeKind).toBe(store === 'PostgreSQL' ? 'postgres' : 'sqlite');
      const submitted = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(reachableProblem({ samples: 0, name: `FLOW-${store}` })) });
      expect(submitted.status).toBe(202);
      const done = await waitForJob(svc, submitted.body.jobId, (s) => ['completed', 'failed'].includes(s.state));
      expect(done.state).toBe('completed');
      const planId: string = done.result.planId;

      const fetched = await svc.request('GET', `/v1/plans/${planId}`, { token: svc.tokens.reviewer });
      const codes: string[] = fetched.body.plan.caveats.map((c: { code: string }) => c.code);
      expect(codes).toContain('PROPOSAL_REQUIRES_REVIEW');

      // alice submitted the job; a reviewer token with her name is still alice.
      const aliceReviewer = (await svc.tokenStore.add('alice', ['reviewer'])).token;
      const own = await svc.request('POST', `/v1/plans/${planId}/reviews`, { token: aliceReviewer, body: { decision: 'approve', acknowledgedCaveatCodes: codes } });
      expect(own.status).toBe(403);
      expect(own.body.error.code).toBe('TWO_PERSON_RULE');

      const approved = await svc.request('POST', `/v1/plans/${planId}/reviews`, {
        token: svc.tokens.reviewer, body: { decision: 'approve', comment: 'checked against the navigation solution', acknowledgedCaveatCodes: codes } });
      expect(approved.status).toBe(201);
      expect(approved.body.plan).toMatchObject({ state: 'approved', decidedBy: 'rita', submittedBy: 'alice' });

      const history = await svc.request('GET', `/v1/plans/${planId}/history`, { token: svc.tokens.auditor });
      expect(history.body.entries.map((e: { kind: string }) => e.kind)).toEqual(['job-submitted', 'plan-proposed', 'review']);
      expect(history.body.entries[0].actor).toBe('alice');

      const bundle = await svc.request('GET', `/v1/plans/${planId}/export?toHead=true`, { token: svc.tokens.auditor });
      expect(checkPlanBundle(bundle.body)).toMatchObject({ ok: true, reachesHead: true });
      expect(bundle.body.plan.problemHash).toBe(done.result.problemHash);

      const verified = await svc.request('GET', '/v1/archive/verify', { token: svc.tokens.auditor });
      expect(verified.body).toMatchObject({ ok: true, firstFailure: null, projectionMismatches: [] });
      expect((await svc.request('GET', '/v1/archive/verify', { token: svc.tokens.reviewer })).status).toBe(403);
    });
  });
});

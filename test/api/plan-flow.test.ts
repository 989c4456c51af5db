/**
 * The main path over HTTP: submit a problem → live progress over server-sent events (WHATWG HTML Living
 * Standard §9.2 event-stream format) → the job completes → the proposed plan is fetched from the archive,
 * and it is the same plan the planner gives in-process for the same problem (the planner is deterministic).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import { readEventStream, startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from '../queue/fixtures.ts';

let svc: TestService;

let worker: Promise<unknown> | null = null;
const ensureWorker = (): Promise<unknown> => (worker ??= svc.startWorkerInProcess({ concurrency: 2 }));

beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

describe('submit → progress → plan', () => {
  describe('when a convergent problem is submitted', () => {
    it('should stream progress, complete, and serve the archived proposed plan', async () => {
      const problem = reachableProblem({ samples: 200 });
      const submitted = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(submitted.status).toBe(202);
      // The worker starts only once the stream is open, so every progress report is live on the stream.
      const stream = await readEventStream(`${svc.url}${submitted.body.eventsUrl}`, svc.tokens.submitter, 60_000, (e) => {
        if (e.event === 'status') void ensureWorker();
      });
      expect(stream.status).toBe(200);
      expect(stream.contentType).toMatch(/^text\/event-stream/);
      const kinds = stream.events.map((e) => e.event);
      expect(kinds[0]).toBe('status');
      expect(kinds.at(-1)).toBe('end');
      const progress = stream.events.filter((e) => e.event === 'progress').map((e) => e.data);
      expect(progress.length).toBeGreaterThan(0);
      expect(progress.map((p) => p.stage)).toEqual(expect.arrayContaining(['correcting']));
      for (const p of progress) expect(p.fraction).toBeGreaterThanOrEqual(0);
      const end = stream.events.at(-1)!.data;
      expect(end.state).toBe('completed');
      expect(end.result.planStatus).toBe('converged');
      expect(end.result.storedIn).toBe('archive');

      const fetched = await svc.request('GET', `/v1/plans/${end.result.planId}`, { token: svc.tokens.reviewer });
      expect(fetched.status).toBe(200);
      expect(fetched.body.notice).toMatch(/review/i);
      expect(fetched.body.summary).toEqual(expect.objectContaining({ jobId: submitted.body.jobId, state: 'proposed', submittedBy: 'alice', converged: true }));
      expect(fetched.body.plan.caveats.map((c: { code: string }) => c.code)).toContain('PROPOSAL_REQUIRES_REVIEW');

      const local = await planManeuvers(parseProblem(problem), { monteCarlo: 'in-process' });
      expect(fetched.body.plan.burns).toEqual(JSON.parse(JSON.stringify(local.burns)));
      expect(fetched.body.plan.problemHash).toBe(local.problemHash);
    });
  });

  describe('when plans are listed with filters', () => {
    it('should filter by spacecraft and convergence', async () => {
      await ensureWorker();
      const a = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(reachableProblem({ name: 'FILTERSAT-A' })) });
      await waitForJob(svc, a.body.jobId, (s) => s.state === 'completed');
      const hit = await svc.request('GET', '/v1/plans?spacecraft=FILTERSAT-A&converged=true', { token: svc.tokens.auditor });
      expect(hit.status).toBe(200);
      expect(hit.body.plans.map((p: { jobId: string }) => p.jobId)).toEqual([a.body.jobId]);
      const miss = await svc.request('GET', '/v1/plans?spacecraft=FILTERSAT-A&converged=false', { token: svc.tokens.auditor });
      expect(miss.body.plans).toEqual([]);
    });
  });

  describe('when the problem does not converge', () => {
    it('should complete the job with a plan marked not-converged (final, not retried)', async () => {
      await ensureWorker();
      const problem = reachableProblem({ samples: 0 });
      problem.targets[0].positionKm = [-6000, 3600, 0];
      problem.corrector = { maxIterations: 3 };
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      const done = await waitForJob(svc, res.body.jobId, (s) => ['completed', 'failed'].includes(s.state));
      expect(done.state).toBe('completed');
      expect(done.attemptsMade).toBe(1); // one attempt, no retry
      expect(done.result.planStatus).toBe('not-converged');
      const plan = await svc.request('GET', `/v1/plans/${done.result.planId}`, { token: svc.tokens.reviewer });
      expect(plan.body.summary.converged).toBe(false);
    });
  });
});

/**
 * Worker behaviour against a real Redis: priority (urgent first), cancellation of a running job through
 * the planner's AbortSignal, the time limit (final, not retried), and lock renewal while the planner runs
 * on its thread (a lock far shorter than the job, with a stalled-job check running often, must not let the
 * job stall).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from './fixtures.ts';

let svc: TestService;

beforeAll(async () => { svc = await startService(); });
afterAll(async () => { await svc?.close(); });

const submit = async (problem: Record<string, unknown>, extra: Record<string, unknown> = {}) => {
  const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem, extra) });
  expect(res.status).toBe(202);
  return res.body.jobId as string;
};

describe('priority', () => {
  describe('when an urgent job is queued behind routine ones', () => {
    it('should run the urgent job first', async () => {
      const routine = [];
      for (let i = 0; i < 3; i++) routine.push(await submit(reachableProblem({ samples: 0, name: `PRIO-R${i}` })));
      const urgent = await submit(reachableProblem({ samples: 0, name: 'PRIO-U' }), { priority: 'urgent' });
      const worker = await svc.startWorkerInProcess({ concurrency: 1 });
      const started = new Map<string, number>();
      for (const id of [...routine, urgent]) {
        const s = await waitForJob(svc, id, (j) => j.state === 'completed', 60_000);
        started.set(id, Date.parse(s.startedAt));
      }
      await worker.close();
      for (const id of routine) expect(started.get(urgent)!).toBeLessThan(started.get(id)!);
      // Routine jobs keep their submission order among themselves (FIFO within a priority).
      expect(started.get(routine[0])!).toBeLessThanOrEqual(started.get(routine[1])!);
      expect(started.get(routine[1])!).toBeLessThanOrEqual(started.get(routine[2])!);
    });
  });
});

describe('cancellation of a running job', () => {
  describe('when the submitter cancels during the Monte Carlo stage', () => {
    it('should stop the planner, end cancelled without retry, and keep the worker usable', async () => {
      // A 4 s lock and a stalled-job check every second: without renewal the job would be declared stalled
      // about 5 s after it started (the lock renews every 2 s, so a loaded machine still has 2 s of slack).
      const worker = await svc.startWorkerInProcess({ concurrency: 1, lockDurationMs: 4_000, stalledIntervalMs: 1_000 });
      const stalled: string[] = [];
      worker.worker.on('stalled', (id) => stalled.push(id));
      // 100 000 samples: some 20 s of Monte Carlo on an idle core, far longer than the hold below.
      const jobId = await submit(reachableProblem({ samples: 100_000 }));
      await waitForJob(svc, jobId, (s) => s.state === 'active' && s.progress?.stage === 'dispersion', 120_000);
      // Held longer than lock + stalled interval: renewal must keep flowing while the thread computes.
      await new Promise((r) => setTimeout(r, 6_500));
      const cancel = await svc.request('POST', `/v1/jobs/${jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'new OD arrived' } });
      expect(cancel.status).toBe(202);
      const end = await waitForJob(svc, jobId, (s) => s.state === 'cancelled' || s.state === 'completed', 60_000);
      expect(end.state).toBe('cancelled');
      expect(end.error.name).toBe('CancelledError');
      expect(end.attemptsMade).toBe(1);
      expect(stalled).toEqual([]);
      expect((await svc.archive!.getJob(jobId))?.state).toBe('cancelled');
      const next = await submit(reachableProblem({ samples: 0, name: 'AFTER-CANCEL' }));
      expect((await waitForJob(svc, next, (s) => s.state === 'completed', 60_000)).result.planStatus).toBe('converged');
      await worker.close();
    }, 240_000);
  });
});

describe('time limit', () => {
  describe('when a job runs past JOB_TIME_LIMIT_S', () => {
    it('should fail it with TimeLimitError once, without retrying', async () => {
      const worker = await svc.startWorkerInProcess({ concurrency: 1, jobTimeLimitS: 1 });
      const jobId = await submit(reachableProblem({ samples: 60_000, name: 'SLOWSAT' }));
      const end = await waitForJob(svc, jobId, (s) => s.state === 'failed' || s.state === 'completed', 60_000);
      expect(end.state).toBe('failed');
      expect(end.error.name).toBe('TimeLimitError');
      expect(end.attemptsMade).toBe(1);
      expect((await svc.archive!.getJob(jobId))?.state).toBe('failed');
      await worker.close();
    });
  });
});

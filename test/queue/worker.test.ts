/**
 * Worker behaviour against a real Redis: priority (urgent first), cancellation of a running job through
 * the planner's AbortSignal, the time limit (final, not retried; counted from the job's first start, so it
 * also bounds a fanned-out run), lock renewal while the planner runs on its thread (a lock far shorter than
 * the job, with a stalled-job check running often, must not let the job stall), which failures are final, and
 * that a final failure reaches clients and the archive as data ({ name, code, field, message }).
 */
import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { InvalidInputError } from '../../propagator/index.ts';
import { JOB_NAMES } from '../../contract/job-types.ts';
import { isFinalFailure } from '../../queue/index.ts';
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

describe('overall time limit of a fanned-out job', () => {
  describe('when its sample batches would run past JOB_TIME_LIMIT_S counted from the first start', () => {
    it('should stop the batches with TimeLimitError and fail the job, although each batch is short', async () => {
      // Batches of 500 samples take about 0.1 s each on an idle core, far below the 8 s limit; pausing the
      // worker while they wait makes the job's overall time pass the limit on any machine.
      const worker = await svc.startWorkerInProcess({ concurrency: 1, jobTimeLimitS: 8, fanOutMinSamples: 1_000, batchSize: 500 });
      const jobId = await submit(reachableProblem({ samples: 20_000, name: 'LONGFANSAT' }));
      const fanned = await waitForJob(svc, jobId, (s) => ['waiting-children', 'completed', 'failed'].includes(s.state), 120_000);
      expect(fanned.state).toBe('waiting-children');
      await worker.worker.pause();
      // The limit counts from the first start the worker recorded in the job's data.
      const parent = await svc.api.deps.queue.queue.getJob(jobId);
      const firstStartedAt = parent?.name === JOB_NAMES.retarget ? parent.data.firstStartedAt : undefined;
      expect(Date.parse(firstStartedAt ?? '')).toBeGreaterThanOrEqual(Date.parse(fanned.startedAt));
      const waitMs = Date.parse(firstStartedAt ?? '') + 8_500 - Date.now();
      if (waitMs > 0) await new Promise((r) => setTimeout(r, waitMs));
      worker.worker.resume();
      const end = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 120_000);
      expect(end.state).toBe('failed');
      const failedBatches = (await svc.api.deps.queue.queue.getJobs(['failed'], 0, 1_000))
        .filter((j) => j && String(j.id).startsWith(`${jobId}-mc-`));
      expect(failedBatches.length).toBeGreaterThan(0);
      expect(failedBatches[0]!.failedReason).toMatch(/^TimeLimitError: stopped at the time limit of 8 s from the job's first start/);
      expect(failedBatches[0]!.attemptsMade).toBe(1);
      expect((await svc.archive!.getJob(jobId))?.state).toBe('failed');
      await worker.close(true);
    }, 240_000);
  });
});

describe('failure classification', () => {
  describe('when a run fails', () => {
    it('should treat invalid input and programming errors as final and other errors as transient', () => {
      expect(isFinalFailure(new InvalidInputError('problem.burns', 'no burns'))).toBe(true);
      expect(isFinalFailure(new TypeError("Cannot read properties of undefined (reading 'x')"))).toBe(true);
      expect(isFinalFailure(new RangeError('Invalid array length'))).toBe(true);
      expect(isFinalFailure(new ReferenceError('plan is not defined'))).toBe(true);
      expect(isFinalFailure(Object.assign(new Error('serialised from the planner thread'), { name: 'TypeError' }))).toBe(true);
      expect(isFinalFailure(Object.assign(new Error('job j-1 was cancelled; no plan is recorded for it'), { name: 'ArchiveConflictError' }))).toBe(true);
      expect(isFinalFailure(new Error('connect ECONNREFUSED 127.0.0.1:5432'))).toBe(false);
    });
  });
});

describe('a final failure as data', () => {
  describe('when a job whose problem fails the relation checks reaches a worker (queued past the API\'s checks)', () => {
    it('should end failed without retry, its status and archive entry naming the field', async () => {
      const worker = await svc.startWorkerInProcess({ concurrency: 1 });
      // The span ends before it starts: a final InvalidInputError from the worker's own parse of the job data.
      const problem = { ...reachableProblem({ samples: 0, name: 'BACKWARDSAT' }), endEpoch: '2031-02-28T00:00:00 TDB' };
      const jobId = `j-${randomUUID()}`;
      await svc.api.deps.queue.queue.add('retarget', {
        problem: problem as never, reason: 'queued past the API checks', priority: 'routine', submittedBy: 'sam',
        submittedAt: new Date().toISOString(), problemHash: '0'.repeat(64), requestHash: '0'.repeat(64), submissionId: randomUUID(), step: 'plan',
      }, { jobId, attempts: 3 });
      const end = await waitForJob(svc, jobId, (s) => s.state === 'failed' || s.state === 'completed', 60_000);
      expect(end.state).toBe('failed');
      expect(end.attemptsMade).toBe(1);
      expect(end.error).toEqual({
        name: 'InvalidInputError', code: 'INVALID_INPUT', field: 'endEpoch', message: 'the end of the span must come after initialState.epoch',
      });
      const failed = (await svc.archive!.entries()).find((e) => e.jobId === jobId && e.kind === 'job-failed');
      expect(failed?.payload).toEqual({ errorName: 'InvalidInputError', message: 'endEpoch: the end of the span must come after initialState.epoch' });
      await worker.close();
    }, 120_000);
  });
});

/**
 * Monte Carlo fan-out: a run at or above the fan-out threshold is split into `dispersion-samples` child jobs
 * (BullMQ parent/child flow) that two workers share; the parent combines them. The planner's contract says
 * sample i depends on (seed, i) only, so the combined plan must equal the single-process run exactly (the
 * plan holds no timestamps or ids, so the whole plan is compared).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import { sampleBatches } from '../../queue/index.ts';
import { readEventStream, startService, waitForJob, type TestService } from '../harness/service.ts';
import { reachableProblem, submission } from './fixtures.ts';

let svc: TestService;
const processedBy = new Map<string, string>();

beforeAll(async () => {
  svc = await startService();
  for (let i = 0; i < 2; i++) {
    const w = await svc.startWorkerInProcess({ concurrency: 1, fanOutMinSamples: 40, batchSize: 100 });
    w.worker.on('completed', (job) => processedBy.set(String(job.id), w.name));
  }
});
afterAll(async () => { await svc?.close(); });

describe('sample batches', () => {
  describe('when 110 samples are split by 25', () => {
    it('should cover [0, 110) without gaps or overlaps', () => {
      expect(sampleBatches(110, 25)).toEqual([
        { firstIndex: 0, count: 25 }, { firstIndex: 25, count: 25 }, { firstIndex: 50, count: 25 },
        { firstIndex: 75, count: 25 }, { firstIndex: 100, count: 10 },
      ]);
    });
  });
});

describe('Monte Carlo fan-out', () => {
  describe('when a job asks for more samples than the fan-out threshold', () => {
    it('should run child jobs on the workers and combine them into the single-process result', async () => {
      // 2000 samples in 20 batches of 100: the idle second worker takes the first batch while the first one
      // still finishes the parent's run, and each batch is long enough for both to take some.
      const problem = reachableProblem({ samples: 2_000, seed: 424242, name: 'FANOUTSAT' });
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      expect(res.status).toBe(202);
      const jobId = res.body.jobId as string;
      const stream = readEventStream(`${svc.url}/v1/jobs/${jobId}/events`, svc.tokens.submitter);
      const end = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 180_000);
      expect(end.state).toBe('completed');

      const children = [...processedBy.keys()].filter((id) => id.startsWith(`${jobId}-mc-`)).sort();
      expect(children).toHaveLength(20);
      expect(new Set(children.map((id) => processedBy.get(id))).size).toBe(2);

      const fetched = await svc.request('GET', `/v1/plans/${end.result.planId}`, { token: svc.tokens.reviewer });
      const local = await planManeuvers(parseProblem(problem), { monteCarlo: 'in-process' });
      expect(fetched.body.plan.dispersion.monteCarlo.samples).toBe(2_000);
      expect(fetched.body.plan).toEqual(JSON.parse(JSON.stringify(local)));

      const events = (await stream).events;
      expect(events.at(-1)?.event).toBe('end');
      const report = (e: { event: string; data: any }) => (e.event === 'progress' ? e.data : e.data.progress);
      const dispersion = events.filter((e) => report(e)?.stage === 'dispersion' && report(e)?.samplesTotal === 2_000);
      expect(dispersion.length).toBeGreaterThan(0);
    }, 300_000);
  });

  describe('when the job is cancelled while its sample batches run', () => {
    it('should end cancelled and record the cancellation in the archive', async () => {
      // 40 000 samples in 400 batches: seconds of work, so the cancel lands while batches remain.
      const problem = reachableProblem({ samples: 40_000, seed: 5, name: 'FANCANCEL' });
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(problem) });
      const jobId = res.body.jobId as string;
      await waitForJob(svc, jobId, (s) => s.state === 'waiting-children', 120_000);
      const cancel = await svc.request('POST', `/v1/jobs/${jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'test' } });
      expect(cancel.status).toBe(202);
      const end = await waitForJob(svc, jobId, (s) => ['cancelled', 'completed', 'failed'].includes(s.state), 120_000);
      expect(end.state).toBe('cancelled');
      expect(end.error.name).toBe('CancelledError');
      expect((await svc.archive!.getJob(jobId))?.state).toBe('cancelled');
    }, 300_000);
  });
});

/**
 * The Δv budget as a service job: its non-linear samples fan out as `budget-samples` child jobs over two
 * workers, the parent assembles them, and — sample i depending on (seed, i) only — the study equals the
 * single-process run exactly. The study is archived once, names no plan, and can be cancelled.
 */
import { readFileSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { runBudget } from '../../planner/index.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { keysOf } from './fixtures.ts';

let svc: TestService;
const processedBy = new Map<string, string>();
const demo = JSON.parse(readFileSync(new URL('../../examples/flyby-budget-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const body = (request: Record<string, unknown>) => ({ request, reason: 'service test: Δv budget of the remaining correction burns' });

beforeAll(async () => {
  svc = await startService();
  for (let i = 0; i < 2; i++) {
    const w = await svc.startWorkerInProcess({ concurrency: 1, batchSize: 3 });
    w.worker.on('completed', (job) => processedBy.set(String(job.id), w.name));
  }
});
afterAll(async () => { await svc?.close(); });

describe('Δv budget jobs', () => {
  describe('when a budget is submitted', () => {
    it('should fan the non-linear samples out and give exactly the single-process study, archived as a study', async () => {
      const request = { ...demo, linearSamples: 300, nonlinearSamples: 9 };
      const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body(request) });
      expect(res.status).toBe(202);
      const jobId = res.body.jobId as string;
      const end = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 240_000, '/v1/budgets');
      expect(end.state).toBe('completed');
      expect(end.kind).toBe('delta-v-budget');
      expect(end.result.agreementPassed).toBe(true);
      const children = [...processedBy.keys()].filter((id) => id.startsWith(`${jobId}-mc-`)).sort();
      expect(children).toHaveLength(3);
      // Once combined and stored, no batch job and no copy of the samples stays in Redis (as for a plan's Monte Carlo).
      const redis = svc.api.deps.queue.redis;
      expect(await keysOf(redis, `${svc.prefix}:*${jobId}-mc-*`)).toEqual([]);
      expect(await keysOf(redis, `${svc.prefix}:*:${jobId}:processed`)).toEqual([]);
      expect(await redis.hget(`${svc.prefix}:retarget:${jobId}`, 'data')).not.toContain('"nominal"');

      const fetched = await svc.request('GET', `/v1/budgets/${jobId}/study`, { token: svc.tokens.reviewer });
      expect(fetched.status).toBe(200);
      const local = await runBudget(request);
      expect(fetched.body.study).toEqual(JSON.parse(JSON.stringify(local)));
      expect(fetched.body.study.caveats[0].code).toBe('PROPOSAL_REQUIRES_REVIEW');
      expect(fetched.body.storedIn).toBe('archive');
      expect((await svc.archive!.getStudyByJob(jobId))?.study).toEqual(fetched.body.study);
      expect(await svc.archive!.getPlanByJob(jobId)).toBeUndefined();
    }, 300_000);
  });

  describe('when the request is invalid', () => {
    it('should answer 400 naming the field', async () => {
      const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body({ ...demo, knowledge: [(demo.knowledge as unknown[])[0]] }) });
      expect(res.status).toBe(400);
      expect(JSON.stringify(res.body)).toContain('request.knowledge');
    });
  });

  describe('when the job is cancelled while its sample batches run', () => {
    it('should end cancelled', async () => {
      const res = await svc.request('POST', '/v1/budgets', { token: svc.tokens.submitter, body: body({ ...demo, linearSamples: 10, nonlinearSamples: 600 }) });
      const jobId = res.body.jobId as string;
      await waitForJob(svc, jobId, (s) => s.state === 'waiting-children', 120_000, '/v1/budgets');
      const cancel = await svc.request('POST', `/v1/budgets/${jobId}/cancel`, { token: svc.tokens.submitter, body: { reason: 'test' } });
      expect(cancel.status).toBe(202);
      const end = await waitForJob(svc, jobId, (s) => ['cancelled', 'completed', 'failed'].includes(s.state), 120_000, '/v1/budgets');
      expect(end.state).toBe('cancelled');
    }, 300_000);
  });
});

/**
 * Redis memory after a fanned-out Monte Carlo job: once the parent has combined the samples and stored the plan,
 * no batch job and no copy of the samples is left in Redis, and what the finished job keeps stays within the
 * documented per-job budget (REDIS_BYTES_PER_JOB, README "Limits"). Memory is Redis's own MEMORY USAGE of each key
 * (Redis command reference). Real Redis, in-process worker, SQLite archive.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { REDIS_BYTES_PER_JOB } from '../../queue/index.ts';
import { startService, waitForJob, type TestService } from '../harness/service.ts';
import { keysOf as keysOfRedis, reachableProblem, submission } from './fixtures.ts';

let svc: TestService;
beforeAll(async () => {
  svc = await startService();
  await svc.startWorkerInProcess({ concurrency: 1, fanOutMinSamples: 40, batchSize: 100 });
});
afterAll(async () => { await svc?.close(); });

const keysOf = (pattern: string): Promise<string[]> => keysOfRedis(svc.api.deps.queue.redis, pattern);

describe('Redis memory of a fanned-out Monte Carlo job', () => {
  describe('when a 1,000-sample job has run as 10 batches and completed', () => {
    it('should leave no batch jobs or sample copies behind, and stay within the per-job budget', async () => {
      const res = await svc.request('POST', '/v1/jobs', { token: svc.tokens.submitter, body: submission(reachableProblem({ samples: 1_000, seed: 99, name: 'MEMSAT' })) });
      expect(res.status).toBe(202);
      const jobId = res.body.jobId as string;
      const end = await waitForJob(svc, jobId, (s) => s.state === 'completed' || s.state === 'failed', 180_000);
      expect(end.state).toBe('completed');
      expect(end.result.planId).toBeTruthy();

      expect(await keysOf(`${svc.prefix}:*-mc-*`)).toEqual([]);
      expect(await keysOf(`${svc.prefix}:retarget:${jobId}:processed`)).toEqual([]);
      const jobKeys = await keysOf(`${svc.prefix}:retarget:${jobId}*`);
      expect(jobKeys).toContain(`${svc.prefix}:retarget:${jobId}`);
      const redis = svc.api.deps.queue.redis;
      let bytes = 0;
      for (const key of jobKeys) bytes += Number(await redis.call('MEMORY', 'USAGE', key, 'SAMPLES', '0'));
      expect(bytes, `keys ${jobKeys.join(', ')}`).toBeLessThan(REDIS_BYTES_PER_JOB);
      // The plan is still served (from the archive) after its samples left Redis.
      const plan = await svc.request('GET', `/v1/plans/${end.result.planId}`, { token: svc.tokens.reviewer });
      expect(plan.body.plan.dispersion.monteCarlo.samples).toBe(1_000);
    }, 240_000);
  });
});

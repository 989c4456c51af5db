/**
 * Socket writes per submission: the producer's commands of one wait (the two admission counts; the job, its id
 * in the submitter's set and that set's expiry) leave in one write to Redis, so a submission without an
 * idempotency key costs two writes instead of five (one with a new key four instead of six), and nothing of it
 * is lost. Writes are counted where a Writable hands its data to the socket (`_write` for one chunk, `_writev`
 * for several: Node.js stream API, "API for stream implementers"). Real Redis (test/harness/redis.ts).
 */
import type { Socket } from 'node:net';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { jobRequestSchema, RetargetQueue } from '../../queue/index.ts';
import { submitterJobsKey } from '../../queue/producer/admission.ts';
import { startRedis, type TestRedis } from '../harness/redis.ts';
import { reachableProblem, submission } from './fixtures.ts';

let redis: TestRedis;
let queue: RetargetQueue;
const prefix = `writes${Date.now().toString(36)}`;
beforeAll(async () => {
  redis = await startRedis();
  queue = new RetargetQueue({ redisUrl: redis.url, prefix });
  await queue.queue.waitUntilReady();
});
afterAll(async () => {
  await queue?.queue.obliterate({ force: true });
  await queue?.close();
  await redis?.stop();
});

/** Counts the batches the socket hands to the system while `run` runs; restores the socket after. */
async function socketWrites<T>(socket: Socket, run: () => Promise<T>): Promise<{ writes: number; result: T }> {
  const target = socket as unknown as Record<'_write' | '_writev', (...args: unknown[]) => unknown>;
  const original = { write: target._write, writev: target._writev };
  let writes = 0;
  target._write = function counted(this: unknown, ...args: unknown[]) { writes++; return original.write.apply(this, args); };
  target._writev = function counted(this: unknown, ...args: unknown[]) { writes++; return original.writev.apply(this, args); };
  try {
    const result = await run();
    return { writes, result };
  } finally {
    target._write = original.write;
    target._writev = original.writev;
  }
}

describe('submission writes to Redis', () => {
  describe('when a job without an idempotency key is submitted', () => {
    it('should send its five commands in two socket writes, one per wait, and store the job and the set entry', async () => {
      const request = jobRequestSchema.parse(submission(reachableProblem({ name: 'WRITESAT' })));
      await queue.submit(request, 'warm-up'); // BullMQ loads its scripts on the first use of each
      const { writes, result } = await socketWrites(queue.redis.stream, () => queue.submit(request, 'writer'));
      expect(result.outcome).toBe('created');
      expect(writes).toBe(2);
      const jobId = (result as { jobId: string }).jobId;
      const stored = await queue.findJob(jobId);
      expect(stored?.data.submittedBy).toBe('writer');
      // No key, so no later submission can name this job: its request hash is neither computed nor stored.
      expect(stored?.data.requestHash).toBeUndefined();
      const key = submitterJobsKey(prefix, 'writer');
      expect(await queue.redis.sismember(key, jobId)).toBe(1);
      expect(await queue.redis.ttl(key)).toBeGreaterThan(0);
    });
  });

  describe('when a job with a new idempotency key is submitted', () => {
    it('should read the key\'s job and cancel record in one write: four writes in all', async () => {
      const request = jobRequestSchema.parse(submission(reachableProblem({ name: 'KEYSAT' }), { idempotencyKey: 'writes-key-1' }));
      await queue.submit(jobRequestSchema.parse(submission(reachableProblem({ name: 'KEYSAT' }), { idempotencyKey: 'writes-warm-up' })), 'keyed');
      const { writes, result } = await socketWrites(queue.redis.stream, () => queue.submit(request, 'keyed'));
      expect(result.outcome).toBe('created');
      // The two reads; the two admission counts; the job with its set entry and expiry; the re-read of the job.
      expect(writes).toBe(4);
      const again = await queue.submit(request, 'keyed');
      expect(again).toEqual({ outcome: 'existing', jobId: (result as { jobId: string }).jobId });
      expect((await queue.findJob((result as { jobId: string }).jobId))?.data.requestHash).toMatch(/^[0-9a-f]{64}$/);
    });
  });

  describe('when twenty jobs are submitted at once', () => {
    it('should send fewer writes than commands and lose none of the jobs', async () => {
      const request = jobRequestSchema.parse(submission(reachableProblem({ name: 'BURSTSAT' })));
      const { writes, result } = await socketWrites(queue.redis.stream,
        () => Promise.all(Array.from({ length: 20 }, () => queue.submit(request, 'burst'))));
      expect(result.every((r) => r.outcome === 'created')).toBe(true);
      expect(writes).toBeLessThan(20 * 5);
      const ids = result.map((r) => (r as { jobId: string }).jobId);
      const stored = await Promise.all(ids.map((id) => queue.findJob(id)));
      expect(stored.filter((job) => job?.data.submittedBy === 'burst')).toHaveLength(20);
      expect(await queue.redis.scard(submitterJobsKey(prefix, 'burst'))).toBe(20);
    });
  });
  describe('when twenty jobs of one submitter arrive together', () => {
    it('should read each admission count once for all of them and still admit and store every job', async () => {
      const request = jobRequestSchema.parse(submission(reachableProblem({ name: 'SHARESAT' })));
      const reads = { waiting: 0, unfinished: 0 };
      const counts = queue.queue.getCountsPerPriority.bind(queue.queue);
      const scard = queue.redis.scard.bind(queue.redis);
      queue.queue.getCountsPerPriority = (async (...args: Parameters<typeof counts>) => { reads.waiting++; return counts(...args); }) as typeof counts;
      queue.redis.scard = ((...args: Parameters<typeof scard>) => { reads.unfinished++; return scard(...args); }) as typeof scard;
      try {
        const result = await Promise.all(Array.from({ length: 20 }, () => queue.submit(request, 'sharer')));
        expect(result.every((r) => r.outcome === 'created')).toBe(true);
        expect(reads).toEqual({ waiting: 1, unfinished: 1 });
        expect(await scard(submitterJobsKey(prefix, 'sharer'))).toBe(20);
        // Once answered, nothing is kept: the next submission reads afresh.
        await queue.submit(request, 'sharer');
        expect(reads).toEqual({ waiting: 2, unfinished: 2 });
      } finally {
        delete (queue.queue as unknown as Record<string, unknown>).getCountsPerPriority;
        delete (queue.redis as unknown as Record<string, unknown>).scard;
      }
    });
  });
});

/**
 * Admission control: how much waiting work the queue accepts, so an overload is refused at the door (with the
 * numbers and when to retry) instead of piling up in Redis. Two limits, both counted before a job is added:
 * - per priority: jobs of that priority waiting for a worker (503 QUEUE_FULL: the service is saturated);
 * - per submitter: that submitter's jobs not yet finished (429 SUBMITTER_QUEUE_FULL: slow down).
 * Checks and adds are not one atomic step, so concurrent submissions may overshoot a limit by their number;
 * a submission that arrives while a count it needs is being read shares that read (shared-read.ts), which
 * widens "concurrent" to the submissions of about two Redis round trips. One count read per batch instead of
 * one per submission is what keeps the door cheap under a burst.
 *
 * Memory budget: a finished job keeps its data (problem, reason, who), progress and result in Redis for
 * JOB_RETENTION_S; Monte Carlo batches and their samples are removed once combined (worker/processor.ts).
 */
import type { Redis } from 'ioredis';
import type { Priority } from '../../contract/index.ts';

/**
 * Redis memory one finished retarget job keeps (its hash and side keys), bytes, for problems of ordinary size;
 * README "Limits". Measured 3,936 B for the test's 1,000-sample fanned-out job (test/queue/redis-memory.test.ts);
 * set four times above. The job data holds the problem, so an unusually large one (up to BODY_LIMIT_KB) adds its size.
 */
export const REDIS_BYTES_PER_JOB = 16 * 1024;

export interface AdmissionLimits {
  /** Waiting jobs of each priority before submissions of that priority are refused (503). */
  waitingPerPriority: Record<Priority, number>;
  /** Unfinished jobs per submitter before that submitter's submissions are refused (429). */
  unfinishedPerSubmitter: number;
  /** Suggested wait before retrying a refused submission, s. */
  retryAfterS: number;
}

/** Frozen defaults (README "Limits" points here). */
export const DEFAULT_ADMISSION: Readonly<AdmissionLimits> = Object.freeze({
  waitingPerPriority: Object.freeze({ urgent: 500, routine: 2_000 }),
  unfinishedPerSubmitter: 200,
  retryAfterS: 30,
});

/** A refused submission, with the numbers. */
export type AdmissionRefusal =
  | { outcome: 'queue-full'; priority: Priority; waiting: number; limit: number; retryAfterS: number }
  | { outcome: 'submitter-full'; submitter: string; unfinished: number; limit: number; retryAfterS: number };

/** Key of the set of a submitter's job ids that may still be unfinished. */
export function submitterJobsKey(prefix: string, submitter: string): string {
  return `${prefix}:veer-submitter-jobs:${submitter}`;
}

/**
 * The submitter's unfinished jobs, exact once the submitter's set holds at least `limit` ids; below that, the
 * set's size (an upper bound: finished ids stay until a count at the limit drops them). The common case is
 * then one SCARD; only a set at the limit is walked (every job hash with `finishedOn`, or none, is dropped,
 * in one pipelined round trip). Walking the set on every submission made each one cost O(set size) in Redis
 * and in this process — thousands of HMGETs per request once a busy submitter had thousands of jobs.
 */
export async function unfinishedJobsOf(redis: Redis, prefix: string, queueKey: string, submitter: string, limit: number): Promise<number> {
  const key = submitterJobsKey(prefix, submitter);
  const size = await redis.scard(key);
  if (size < limit) return size;
  const ids = await redis.smembers(key);
  const pipeline = redis.pipeline();
  for (const id of ids) pipeline.hmget(`${queueKey}:${id}`, 'finishedOn', 'name');
  const answers = (await pipeline.exec()) ?? [];
  const done = ids.filter((_, i) => {
    const [finishedOn, name] = (answers[i]?.[1] ?? [null, null]) as [string | null, string | null];
    return name === null || finishedOn !== null;
  });
  if (done.length > 0) await redis.srem(key, ...done);
  return ids.length - done.length;
}

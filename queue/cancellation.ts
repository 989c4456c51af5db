/**
 * Cancellation across processes. BullMQ's `worker.cancelJob` only reaches jobs running in the same process,
 * so a cancel request (1) leaves a marker key that any worker checks before and while running the job,
 * and (2) is published on a channel every worker listens to; the worker running the job aborts it.
 */
import type { Redis } from 'ioredis';

/** What is kept about a cancel request. */
export interface CancelRecord {
  by: string;
  at: string;
  reason: string;
  /** The cancelled job's request hash, so a resubmission with its idempotency key can tell a repeat from other work. */
  requestHash?: string;
  /** Set when the job was removed before it ever ran (it then has no BullMQ state). */
  removedWhileWaiting?: {
    submittedBy: string; submittedAt: string; reason: string; priority: string; spacecraftName: string;
    /** Which kind of job it was (absent in records written before budgets: a retarget job). */
    kind?: 'retarget' | 'delta-v-budget';
  };
}

export function cancelKey(prefix: string, jobId: string): string {
  return `${prefix}:veer-cancel:${jobId}`;
}

export function cancelChannel(prefix: string): string {
  return `${prefix}:veer-cancel-requests`;
}

/** Stores the marker (kept `ttlS` seconds) and tells every worker. */
export async function requestCancel(redis: Redis, prefix: string, jobId: string, record: CancelRecord, ttlS: number): Promise<void> {
  await redis.set(cancelKey(prefix, jobId), JSON.stringify(record), 'EX', ttlS);
  await redis.publish(cancelChannel(prefix), jobId);
}

export async function readCancel(redis: Redis, prefix: string, jobId: string): Promise<CancelRecord | null> {
  const raw = await redis.get(cancelKey(prefix, jobId));
  return raw ? (JSON.parse(raw) as CancelRecord) : null;
}

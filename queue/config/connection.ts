/** Redis connections for queues and workers (ioredis). */
import { Redis } from 'ioredis';

/**
 * A connection for BullMQ. Workers and event listeners need `maxRetriesPerRequest: null` (BullMQ's advice for
 * blocking commands); producers in an HTTP request path fail fast instead (`failFast`).
 */
export function createRedis(url: string, opts: { failFast?: boolean; name?: string; onError?: (err: Error) => void } = {}): Redis {
  const redis = new Redis(url, {
    maxRetriesPerRequest: opts.failFast ? 2 : null,
    enableOfflineQueue: true,
    ...(opts.name ? { connectionName: opts.name } : {}),
    // Keep retrying while Redis restarts; cap the delay so recovery is quick.
    retryStrategy: (times) => Math.min(times * 100, 2_000),
  });
  // ioredis reconnects by itself; report at most one error per 10 s instead of one per retry.
  let lastReport = 0;
  redis.on('error', (err: Error) => {
    const now = Date.now();
    if (now - lastReport < 10_000) return;
    lastReport = now;
    opts.onError?.(err);
  });
  return redis;
}

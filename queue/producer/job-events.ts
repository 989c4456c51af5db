/**
 * One QueueEvents listener per process, fanned out to per-job subscribers (the API's progress streams and
 * metrics). Events come from the Redis stream BullMQ writes, so they reach every API replica.
 */
import { EventEmitter } from 'node:events';
import { QueueEvents } from 'bullmq';
import { createRedis } from '../config/connection.ts';
import { RETARGET_QUEUE } from '../../contract/job-types.ts';

export type JobEvent =
  | { type: 'active'; jobId: string }
  | { type: 'progress'; jobId: string; data: unknown }
  | { type: 'waiting-children'; jobId: string }
  | { type: 'completed'; jobId: string }
  | { type: 'failed'; jobId: string; failedReason: string }
  | { type: 'removed'; jobId: string };

export class JobEventHub {
  private readonly events: QueueEvents;
  private readonly emitter = new EventEmitter();
  private readonly connection;

  constructor(redisUrl: string, prefix: string) {
    this.emitter.setMaxListeners(0);
    this.connection = createRedis(redisUrl, { name: 'veer-events' });
    this.events = new QueueEvents(RETARGET_QUEUE, { connection: this.connection, prefix });
    const forward = (e: JobEvent): void => { this.emitter.emit(e.jobId, e); this.emitter.emit('*', e); };
    this.events.on('active', ({ jobId }) => forward({ type: 'active', jobId }));
    this.events.on('progress', ({ jobId, data }) => forward({ type: 'progress', jobId, data }));
    this.events.on('waiting-children', ({ jobId }) => forward({ type: 'waiting-children', jobId }));
    this.events.on('completed', ({ jobId }) => forward({ type: 'completed', jobId }));
    this.events.on('failed', ({ jobId, failedReason }) => forward({ type: 'failed', jobId, failedReason }));
    this.events.on('removed', ({ jobId }) => forward({ type: 'removed', jobId }));
    this.events.on('error', () => { /* reconnects by itself; readiness reports Redis trouble */ });
  }

  /** Resolves when the listener is connected (events before that are not seen). */
  async ready(): Promise<void> { await this.events.waitUntilReady(); }

  /** Calls `listener` for every event of `jobId` ('*' for all jobs); returns the unsubscribe function. */
  subscribe(jobId: string, listener: (e: JobEvent) => void): () => void {
    this.emitter.on(jobId, listener);
    return () => { this.emitter.off(jobId, listener); };
  }

  async close(): Promise<void> {
    if (this.connection.status !== 'ready') {
      // Redis out of reach: BullMQ's close would wait for a connection that may never come. Drop ours and
      // let the listener's close finish in the background.
      this.connection.disconnect();
      void this.events.close().catch(() => {});
      return;
    }
    await this.events.close();
    this.connection.disconnect();
  }
}

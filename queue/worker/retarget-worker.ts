/**
 * A worker of the retarget queue: BullMQ Worker + planner thread pool + cancel listener + plan sink.
 * Start several (processes or machines) against one Redis to scale out.
 */
import { hostname } from 'node:os';
import { Queue, Worker, type Job } from 'bullmq';
import type { Logger } from 'pino';
import { planLeapSeconds } from '../../planner/index.ts';
import { BUILTIN_LEAP_SECONDS, type LeapSecondTable } from '../../propagator/index.ts';
import { cancelChannel, readCancel } from '../cancellation.ts';
import { createRedis } from '../config/connection.ts';
import { JOB_NAMES, RETARGET_QUEUE, type RetargetJobData, type SampleBatchData } from '../../contract/job-types.ts';
import type { EphemerisSets } from '../config/ephemeris-sets.ts';
import type { PlanSink } from './plan-sink.ts';
import { PlannerPool } from './planner-pool.ts';
import { processRetarget, processSamples } from './processor.ts';
import type { ProcessorDeps } from './job-run.ts';
import { processBudget, processBudgetBatch } from './budget-processor.ts';
import { BUDGET_JOB_NAMES, type BudgetBatchData, type BudgetJobData } from '../../contract/budget-job-types.ts';

export interface RetargetWorkerOptions {
  redisUrl: string;
  prefix: string;
  sink: PlanSink;
  logger: Logger;
  /** @defaultValue 1 */
  concurrency?: number;
  /** @defaultValue 900 */
  jobTimeLimitS?: number;
  /** @defaultValue 30000 */
  lockDurationMs?: number;
  /** @defaultValue 30000 */
  stalledIntervalMs?: number;
  /** @defaultValue 2 */
  maxStalledCount?: number;
  /** @defaultValue 1000 */
  fanOutMinSamples?: number;
  /** @defaultValue 250 */
  batchSize?: number;
  /** @defaultValue 7 days */
  retentionS?: number;
  /** Name shown in `getWorkers` and as the archive actor. @defaultValue `worker@<host>:<pid>` */
  name?: string;
  /** Table for jobs queued without one (each job normally carries the API's). @defaultValue BUILTIN_LEAP_SECONDS */
  leapSeconds?: LeapSecondTable;
  /** The service's named ephemeris sets (loadEphemerisSets of EPHEMERIS_DIR) a problem may choose.
   * @defaultValue none */
  ephemerisSets?: EphemerisSets;
}

export interface RetargetWorker {
  readonly worker: Worker;
  readonly name: string;
  /** Stops taking jobs; waits for running ones unless `force`. */
  close(force?: boolean): Promise<void>;
}

/** Starts a worker; resolves once it is connected and taking jobs. */
export async function startRetargetWorker(opts: RetargetWorkerOptions): Promise<RetargetWorker> {
  const name = opts.name ?? `worker@${hostname()}:${process.pid}`;
  const concurrency = opts.concurrency ?? 1;
  const onError = (err: Error): void => opts.logger.warn({ err: err.message }, 'Redis connection trouble; retrying');
  const connection = createRedis(opts.redisUrl, { name, onError });
  const subscriber = createRedis(opts.redisUrl, { onError });
  const pool = new PlannerPool({ size: concurrency });
  await pool.warm();
  const queue = new Queue(RETARGET_QUEUE, { connection, prefix: opts.prefix });
  const running = new Map<string, { parentId: string | null; cancel: (by: string) => void }>();

  const deps: ProcessorDeps = {
    pool, sink: opts.sink, redis: connection, prefix: opts.prefix, queue, actor: name, logger: opts.logger,
    jobTimeLimitS: opts.jobTimeLimitS ?? 900, leapSeconds: planLeapSeconds(opts.leapSeconds ?? BUILTIN_LEAP_SECONDS),
    fanOutMinSamples: opts.fanOutMinSamples ?? 1_000,
    batchSize: opts.batchSize ?? 250, ephemerisSets: opts.ephemerisSets ?? new Map(), retentionS: opts.retentionS ?? 7 * 86_400,
    track: (jobId, parentId, cancel) => {
      running.set(jobId, { parentId, cancel });
      return () => { running.delete(jobId); };
    },
  };

  const worker = new Worker(RETARGET_QUEUE, async (job: Job, token?: string, signal?: AbortSignal) => {
    if (job.name === JOB_NAMES.samples) return processSamples(deps, job as Job<SampleBatchData>, signal);
    if (job.name === BUDGET_JOB_NAMES.samples) return processBudgetBatch(deps, job as Job<BudgetBatchData>, signal);
    if (job.name === BUDGET_JOB_NAMES.budget) return processBudget(deps, job as Job<BudgetJobData>, token, signal);
    return processRetarget(deps, job as Job<RetargetJobData>, token, signal);
  }, {
    connection, prefix: opts.prefix, name, concurrency,
    lockDuration: opts.lockDurationMs ?? 30_000,
    stalledInterval: opts.stalledIntervalMs ?? 30_000,
    maxStalledCount: opts.maxStalledCount ?? 2,
  });
  // Connection errors repeat on every retry while Redis is away: log them at most once per 10 s.
  let lastError = 0;
  const logError = (err: Error): void => {
    if (Date.now() - lastError < 10_000) return;
    lastError = Date.now();
    opts.logger.error({ err: err.message }, 'queue error (retrying)');
  };
  worker.on('error', logError);
  queue.on('error', logError);
  worker.on('failed', (job, err) => {
    opts.logger.warn({ jobId: job?.id, attemptsMade: job?.attemptsMade, reason: err.message }, 'job failed');
    // A job failed by the stalled-job check never reached the processor's error path: record it here.
    if (job && (job.name === JOB_NAMES.retarget || job.name === BUDGET_JOB_NAMES.budget) && /stalled/i.test(err.message)) {
      const failure = { name: 'StalledJobError', code: 'STALLED', message: err.message };
      job.updateData({ ...job.data, failure })
        .then(() => opts.sink.recordFailed({ jobId: String(job.id), actor: name, failure }))
        .catch((e: unknown) => opts.logger.error({ err: e, jobId: job.id }, 'could not record the stalled job\'s failure'));
    }
  });
  worker.on('completed', (job) => opts.logger.info({ jobId: job.id, name: job.name }, 'job completed'));
  worker.on('stalled', (jobId) => opts.logger.warn({ jobId }, 'job stalled; taken back to the queue'));

  // Cancel requests: abort the job (and its running sample batches) if it runs here.
  await subscriber.subscribe(cancelChannel(opts.prefix));
  subscriber.on('message', (_channel: string, jobId: string) => {
    const targets = [...running].filter(([id, entry]) => id === jobId || entry.parentId === jobId);
    if (targets.length === 0) return;
    readCancel(connection, opts.prefix, jobId).then((record) => {
      for (const [, entry] of targets) entry.cancel(record?.by ?? 'unknown');
    }, (err: unknown) => opts.logger.error({ err, jobId }, 'could not read cancel request'));
  });
  await worker.waitUntilReady();
  opts.logger.info({ name, concurrency, prefix: opts.prefix }, 'worker ready');

  return {
    worker, name,
    async close(force = false) {
      await worker.close(force);
      await pool.close();
      await queue.close();
      subscriber.disconnect();
      connection.disconnect();
    },
  };
}


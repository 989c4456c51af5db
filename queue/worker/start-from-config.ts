/** Start-up shared by `npm run worker` and `npm run serve`: the plan sink and one worker, both from WorkerConfig. */
import { openArchive } from '../../archive/index.ts';
import type { Logger } from 'pino';
import { ArchivePlanSink, JobResultSink, type PlanSink } from './plan-sink.ts';
import { startRetargetWorker, type RetargetWorker } from './retarget-worker.ts';
import type { WorkerConfig } from '../config/worker-config.ts';
import { loadServiceLeapSeconds, logLeapSecondsAtStart } from './leap-seconds-file.ts';
import { loadEphemerisSets, logEphemerisSetsAtStart } from '../config/ephemeris-sets.ts';

/** Chooses the PlanSink from configuration: the job's result only, or the archive (SQLite in DATA_DIR, or
 * PostgreSQL by DATABASE_URL). */
export async function createPlanSink(config: Pick<WorkerConfig, 'PLAN_SINK' | 'DATA_DIR' | 'DATABASE_URL'>): Promise<PlanSink> {
  if (config.PLAN_SINK === 'job-result') return new JobResultSink();
  const archive = await openArchive({
    dataDir: config.DATA_DIR, ...(config.DATABASE_URL ? { databaseUrl: config.DATABASE_URL } : {}),
  });
  return new ArchivePlanSink(archive);
}

/** Opens the configured plan sink, then starts a worker that writes to it; the caller closes both (worker first). */
export async function startWorkerFromConfig(config: WorkerConfig, logger: Logger): Promise<{ worker: RetargetWorker; sink: PlanSink }> {
  const leapSeconds = await loadServiceLeapSeconds(config.VEER_LEAP_SECONDS);
  logLeapSecondsAtStart(leapSeconds, logger, new Date());
  const ephemerisSets = await loadEphemerisSets(config.EPHEMERIS_DIR, leapSeconds);
  logEphemerisSetsAtStart(ephemerisSets, logger);
  const sink = await createPlanSink(config);
  const worker = await startRetargetWorker({
    redisUrl: config.REDIS_URL, prefix: config.QUEUE_PREFIX, sink, logger,
    concurrency: config.WORKER_CONCURRENCY, jobTimeLimitS: config.JOB_TIME_LIMIT_S,
    lockDurationMs: config.LOCK_DURATION_MS, stalledIntervalMs: config.STALLED_INTERVAL_MS,
    maxStalledCount: config.MAX_STALLED_COUNT, fanOutMinSamples: config.MC_FANOUT_MIN_SAMPLES,
    batchSize: config.MC_BATCH_SIZE, retentionS: config.JOB_RETENTION_S, leapSeconds, ephemerisSets,
  });
  return { worker, sink };
}

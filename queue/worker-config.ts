/**
 * The worker's configuration, from environment variables (validated at start-up; see README "Service").
 * Durations carry their unit in the name.
 */
import { z } from 'zod';
import { envInt, logLevelSchema, parseEnv, postgresUrlSchema, redisUrlSchema } from '../contract/env-config.ts';

export const workerEnvSchema = z.object({
  REDIS_URL: redisUrlSchema.default('redis://127.0.0.1:6379'),
  /** Prefix of every Redis key of the queues (lets several deployments share one Redis). */
  QUEUE_PREFIX: z.string().regex(/^[a-z0-9_-]{1,32}$/, { error: 'must be 1–32 of a-z 0-9 _ -' }).default('veer'),
  /** Jobs one worker process runs at once (each on its own planner thread). */
  WORKER_CONCURRENCY: envInt(1, 64, 1),
  /** Wall-clock limit of a job from its first start, s: covers retries, take-overs and fanned-out sample batches. */
  JOB_TIME_LIMIT_S: envInt(1, 86_400, 900),
  /** Lock duration of an active job, ms; a dead worker's job is taken over after about this long. */
  LOCK_DURATION_MS: envInt(1_000, 600_000, 30_000),
  /** How often workers look for jobs whose lock expired, ms. */
  STALLED_INTERVAL_MS: envInt(500, 600_000, 30_000),
  /** Times a job may be taken over after its worker died before it is failed. */
  MAX_STALLED_COUNT: envInt(0, 10, 2),
  /** Monte Carlo runs with at least this many samples fan out as child jobs. */
  MC_FANOUT_MIN_SAMPLES: envInt(1, 1_000_000, 1_000),
  /** Samples per child job of a fanned-out Monte Carlo run. */
  MC_BATCH_SIZE: envInt(1, 100_000, 250),
  /** Folder of the SQLite archive (archive.sqlite) when DATABASE_URL is unset. */
  DATA_DIR: z.string().min(1).default('./data'),
  /** PostgreSQL archive; when unset the archive is a SQLite file in DATA_DIR. */
  DATABASE_URL: postgresUrlSchema.optional(),
  /** `job-result` keeps plans only in the job's result (no archive); `archive` appends them to the archive. */
  PLAN_SINK: z.enum(['archive', 'job-result'], { error: 'must be archive or job-result' }).default('archive'),
  /** Seconds finished jobs are kept in Redis (status, result, cancellation records). */
  JOB_RETENTION_S: envInt(60, 90 * 86_400, 7 * 86_400),
  LOG_LEVEL: logLevelSchema,
});

export type WorkerConfig = z.infer<typeof workerEnvSchema>;

/** Reads and validates the worker's environment; throws ConfigError naming every bad variable. */
export function loadWorkerConfig(env: NodeJS.ProcessEnv = process.env): WorkerConfig {
  return parseEnv(workerEnvSchema, env);
}

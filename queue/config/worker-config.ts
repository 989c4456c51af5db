/**
 * The worker's configuration, from environment variables (validated at start-up; see README "Service").
 * Durations carry their unit in the name.
 */
import * as z from 'zod';
import { envInt, parseEnv, sharedServiceEnvShape } from '../../contract/env-config.ts';

export const workerEnvSchema = z.object({
  ...sharedServiceEnvShape,
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
});

export type WorkerConfig = z.infer<typeof workerEnvSchema>;

/** Reads and validates the worker's environment; throws ConfigError naming every bad variable. */
export function loadWorkerConfig(env: NodeJS.ProcessEnv = process.env): WorkerConfig {
  return parseEnv(workerEnvSchema, env);
}

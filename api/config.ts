/**
 * The API server's configuration, from environment variables (validated at start-up; see README "Service").
 */
import { z } from 'zod';
import { envInt, logLevelSchema, parseEnv, postgresUrlSchema, redisUrlSchema } from '../queue/index.ts';

export const apiEnvSchema = z.object({
  REDIS_URL: redisUrlSchema.default('redis://127.0.0.1:6379'),
  QUEUE_PREFIX: z.string().regex(/^[a-z0-9_-]{1,32}$/, { error: 'must be 1–32 of a-z 0-9 _ -' }).default('veer'),
  PORT: envInt(0, 65_535, 8080),
  HOST: z.string().min(1).default('0.0.0.0'),
  /** Folder of the SQLite archive and token files when DATABASE_URL is unset. */
  DATA_DIR: z.string().min(1).default('./data'),
  DATABASE_URL: postgresUrlSchema.optional(),
  /** Where plans are read from: `archive`, or `job-result` (must match the workers' PLAN_SINK). */
  PLAN_SINK: z.enum(['archive', 'job-result'], { error: 'must be archive or job-result' }).default('archive'),
  /** Largest accepted request body, KiB. */
  BODY_LIMIT_KB: envInt(1, 10_240, 256),
  /** Rate limit per bearer token (per address for anonymous calls): requests per window. */
  RATE_LIMIT_MAX: envInt(1, 1_000_000, 600),
  RATE_LIMIT_WINDOW_S: envInt(1, 86_400, 60),
  /** Requests with an unknown, revoked or malformed bearer token per window per client address (then 429). */
  AUTH_FAILURE_LIMIT_MAX: envInt(1, 1_000_000, 60),
  /** Tries of a job whose failure was transient. */
  JOB_ATTEMPTS: envInt(1, 20, 3),
  JOB_RETENTION_S: envInt(60, 90 * 86_400, 7 * 86_400),
  /** Seconds between keep-alive comments on progress streams. */
  SSE_HEARTBEAT_S: envInt(1, 300, 15),
  /** Express `trust proxy` hops (set when behind a reverse proxy so client addresses are right). */
  TRUST_PROXY: envInt(0, 10, 0),
  LOG_LEVEL: logLevelSchema,
});

export type ApiConfig = z.infer<typeof apiEnvSchema>;

/** Reads and validates the API's environment; throws ConfigError naming every bad variable. */
export function loadApiConfig(env: NodeJS.ProcessEnv = process.env): ApiConfig {
  return parseEnv(apiEnvSchema, env);
}

/**
 * The API server's configuration, from environment variables (validated at start-up; see README "Service").
 */
import * as z from 'zod';
import { envInt, parseEnv, sharedServiceEnvShape } from '../contract/env-config.ts';
import { DEFAULT_ADMISSION } from '../queue/index.ts';

export const apiEnvSchema = z.object({
  ...sharedServiceEnvShape,
  PORT: envInt(0, 65_535, 8080),
  HOST: z.string().min(1).default('0.0.0.0'),
  /** Largest accepted request body, KiB. */
  BODY_LIMIT_KB: envInt(1, 10_240, 256),
  /** Rate limit per bearer token (per address for anonymous calls): requests per window. */
  RATE_LIMIT_MAX: envInt(1, 1_000_000, 600),
  RATE_LIMIT_WINDOW_S: envInt(1, 86_400, 60),
  /** Requests with an unknown, revoked or malformed bearer token per window per client address (then 429). */
  AUTH_FAILURE_LIMIT_MAX: envInt(1, 1_000_000, 60),
  /** Tries of a job whose failure was transient. */
  JOB_ATTEMPTS: envInt(1, 20, 3),
  /** Seconds between keep-alive comments on progress streams. */
  SSE_HEARTBEAT_S: envInt(1, 300, 15),
  /** Express `trust proxy` hops (set when behind a reverse proxy so client addresses are right). */
  TRUST_PROXY: envInt(0, 10, 0),
  /** Urgent / routine jobs waiting for a worker before submissions of that priority get 503 QUEUE_FULL. */
  QUEUE_LIMIT_URGENT: envInt(1, 10_000_000, DEFAULT_ADMISSION.waitingPerPriority.urgent),
  QUEUE_LIMIT_ROUTINE: envInt(1, 10_000_000, DEFAULT_ADMISSION.waitingPerPriority.routine),
  /** Unfinished jobs per submitter before that submitter gets 429 SUBMITTER_QUEUE_FULL. */
  QUEUE_LIMIT_PER_SUBMITTER: envInt(1, 10_000_000, DEFAULT_ADMISSION.unfinishedPerSubmitter),
  /** Retry-After of a submission refused by those limits, s. */
  QUEUE_FULL_RETRY_AFTER_S: envInt(1, 3_600, DEFAULT_ADMISSION.retryAfterS),
});

export type ApiConfig = z.infer<typeof apiEnvSchema>;

/** Reads and validates the API's environment; throws ConfigError naming every bad variable. */
export function loadApiConfig(env: NodeJS.ProcessEnv = process.env): ApiConfig {
  return parseEnv(apiEnvSchema, env);
}

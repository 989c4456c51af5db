/**
 * The API server's configuration, from environment variables (validated at start-up; see README "Service").
 */
import { z } from 'zod';
import { envInt, parseEnv, sharedServiceEnvShape } from '../contract/env-config.ts';

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
});

export type ApiConfig = z.infer<typeof apiEnvSchema>;

/** Reads and validates the API's environment; throws ConfigError naming every bad variable. */
export function loadApiConfig(env: NodeJS.ProcessEnv = process.env): ApiConfig {
  return parseEnv(apiEnvSchema, env);
}

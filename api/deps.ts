/** What createApp needs: everything with I/O is passed in (tests build real ones against a real Redis). */
import type { Logger } from 'pino';
import type { PlanArchive } from '../archive/index.ts';
import type { EphemerisSets, JobEventHub, RetargetQueue } from '../queue/index.ts';
import type { TokenStore } from './auth/index.ts';
import type { ServiceMetrics } from './metrics.ts';
import type { PlanReader } from './plan-reader.ts';

export interface AppLimits {
  /** Largest request body, bytes. */
  bodyLimitBytes: number;
  /** Requests per window per token (per address when anonymous). */
  rateLimitMax: number;
  rateLimitWindowMs: number;
  /** Requests with a refused bearer token per window per client address, before every such address is answered 429. */
  authFailureLimitMax: number;
  /** Keep-alive comment interval on progress streams, ms. */
  sseHeartbeatMs: number;
  /** Express `trust proxy` hops. */
  trustProxy: number;
}

export interface AppDeps {
  queue: RetargetQueue;
  events: JobEventHub;
  tokens: TokenStore;
  /** The plan archive; null when plans live in job results (PLAN_SINK=job-result). */
  archive: PlanArchive | null;
  plans: PlanReader;
  metrics: ServiceMetrics;
  logger: Logger;
  limits: AppLimits;
  /** The named ephemeris sets loaded from EPHEMERIS_DIR at start-up (empty when unset). */
  ephemerisSets: EphemerisSets;
  /** Software version shown in the OpenAPI document. */
  version: string;
}

/** Frozen defaults for limits (the README's table points here). */
export const DEFAULT_LIMITS: Readonly<AppLimits> = Object.freeze({
  bodyLimitBytes: 256 * 1024, rateLimitMax: 600, rateLimitWindowMs: 60_000, authFailureLimitMax: 60, sseHeartbeatMs: 15_000, trustProxy: 0,
});

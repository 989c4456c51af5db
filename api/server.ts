/**
 * Builds the API's dependencies from configuration and listens. `startApiServer` is used by `npm run api`
 * (api/main.ts) and by the test harness.
 */
import { PACKAGE_VERSION } from '../contract/software-version.ts';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import type { Logger } from 'pino';
import { openArchive, type PlanArchive } from '../archive/index.ts';
import { maskConfigValue } from '../contract/env-config.ts';
import {
  JobEventHub, loadEphemerisSets, loadServiceLeapSeconds, logEphemerisSetsAtStart, logLeapSecondsAtStart, RetargetQueue,
} from '../queue/index.ts';
import { createApp } from './app.ts';
import { openTokenStore, type TokenStore } from './auth/index.ts';
import type { ApiConfig } from './config.ts';
import type { AppDeps } from './deps.ts';
import { ServiceMetrics } from './metrics.ts';
import { ArchivePlanReader, JobResultPlanReader } from './plan-reader.ts';

export interface ApiServer {
  server: Server;
  deps: AppDeps;
  /** http://host:port */
  url: string;
  close(): Promise<void>;
}

/** Logs whether Redis answers: once at start, then on every loss and every return of the connection. */
function reportRedisState(queue: RetargetQueue, redisUrl: string, logger: Logger): void {
  const where = maskConfigValue('REDIS_URL', redisUrl);
  if (!queue.connected) logger.warn({ redis: where }, 'Redis not answering yet: API not ready (job routes answer 503) until it does');
  let up = queue.connected;
  queue.redis.on('ready', () => { up = true; logger.info({ redis: where }, 'Redis answers: API ready'); });
  queue.redis.on('close', () => {
    if (!up) return; // a failed reconnect attempt, not a new loss
    up = false;
    logger.warn({ redis: where }, 'Redis connection lost: job routes answer 503 until it returns');
  });
}

/** Opens Redis, the archive and the token store, and listens on config.HOST:config.PORT (0 = any free port). */
export async function startApiServer(config: ApiConfig, logger: Logger, overrides: { tokens?: TokenStore; archive?: PlanArchive | null } = {}): Promise<ApiServer> {
  const leapSeconds = await loadServiceLeapSeconds(config.VEER_LEAP_SECONDS);
  logLeapSecondsAtStart(leapSeconds, logger, new Date());
  // Before anything is opened: a corrupt set stops the start naming the file, line and keyword.
  const ephemerisSets = await loadEphemerisSets(config.EPHEMERIS_DIR, leapSeconds);
  logEphemerisSetsAtStart(ephemerisSets, logger);
  const queue = new RetargetQueue({
    redisUrl: config.REDIS_URL, prefix: config.QUEUE_PREFIX, attempts: config.JOB_ATTEMPTS, retentionS: config.JOB_RETENTION_S,
    leapSeconds,
    admission: {
      waitingPerPriority: { urgent: config.QUEUE_LIMIT_URGENT, routine: config.QUEUE_LIMIT_ROUTINE },
      unfinishedPerSubmitter: config.QUEUE_LIMIT_PER_SUBMITTER, retryAfterS: config.QUEUE_FULL_RETRY_AFTER_S,
    },
  });
  // Not awaited: the API listens at once and reports not-ready (/ready 503, job routes 503) until Redis answers.
  const events = new JobEventHub(config.REDIS_URL, config.QUEUE_PREFIX);
  const store = { dataDir: config.DATA_DIR, ...(config.DATABASE_URL ? { databaseUrl: config.DATABASE_URL } : {}) };
  const archive = overrides.archive !== undefined ? overrides.archive
    : config.PLAN_SINK === 'archive' ? await openArchive(store) : null;
  const tokens = overrides.tokens ?? await openTokenStore(store);
  const metrics = new ServiceMetrics(queue);
  metrics.watch(events);
  const deps: AppDeps = {
    queue, events, tokens, archive, metrics, logger, version: PACKAGE_VERSION, ephemerisSets,
    plans: archive ? new ArchivePlanReader(archive) : new JobResultPlanReader(queue),
    limits: {
      bodyLimitBytes: config.BODY_LIMIT_KB * 1024, rateLimitMax: config.RATE_LIMIT_MAX,
      rateLimitWindowMs: config.RATE_LIMIT_WINDOW_S * 1000, authFailureLimitMax: config.AUTH_FAILURE_LIMIT_MAX,
      sseHeartbeatMs: config.SSE_HEARTBEAT_S * 1000,
      trustProxy: config.TRUST_PROXY,
    },
  };
  const server = createServer(createApp(deps));
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(config.PORT, config.HOST, () => resolve());
  });
  const address = server.address() as AddressInfo;
  const host = config.HOST === '0.0.0.0' ? '127.0.0.1' : config.HOST;
  logger.info({ port: address.port, planStore: archive ? archive.storeKind : 'job-result' }, 'API listening');
  reportRedisState(queue, config.REDIS_URL, logger);
  return {
    server, deps, url: `http://${host}:${address.port}`,
    async close() {
      server.closeAllConnections();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      metrics.stop();
      await events.close();
      await queue.close();
      if (!overrides.tokens) await tokens.close();
      if (archive && overrides.archive === undefined) await archive.close();
    },
  };
}

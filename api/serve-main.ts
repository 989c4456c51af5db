/**
 * `npm run serve`: API + one worker + (when REDIS_URL is unset) a private redis-server, all on this machine.
 * For trying veer out or a single-machine install; production runs `npm run api` and `npm run worker`
 * separately (see docker-compose.yml). SIGTERM or SIGINT stops everything it started (see stopAll).
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import {
  ConfigError, createLogger, loadWorkerConfig, startLocalRedis, startWorkerFromConfig, type LocalRedis,
} from '../queue/index.ts';
import { CONSOLE_DIST_DIR } from '../console/index.ts';
import { loadApiConfig } from './config.ts';
import { startApiServer } from './server.ts';

/**
 * How long a running job may take to finish after a stop signal, ms. Past it the worker lets the job go
 * unfinished: its lock in Redis lapses and the next start picks it up again (nothing is lost), so the whole
 * stop stays inside 10 s.
 */
const DRAIN_LIMIT_MS = 6_000;
/** Past this the process exits whatever is still pending (the private Redis is killed first), ms. */
const STOP_LIMIT_MS = 9_000;

type Stoppable = { close(): Promise<void> };

/** Stops in dependency order: API (no new requests), worker (drained, bounded), plan sink, private Redis. */
async function stopAll(api: Stoppable, worker: Stoppable, sink: Stoppable, localRedis: LocalRedis | null,
  log: (message: string) => void): Promise<void> {
  await api.close();
  const drained = await Promise.race([
    worker.close().then(() => true),
    new Promise<false>((r) => setTimeout(() => r(false), DRAIN_LIMIT_MS).unref()),
  ]);
  if (drained) await sink.close();
  else log(`the running job did not finish within ${DRAIN_LIMIT_MS / 1000} s; it stays queued for the next start`);
  await localRedis?.stop();
}

async function main(): Promise<void> {
  let localRedis: LocalRedis | null = null;
  // A signal while starting: nothing to drain yet; the private Redis is stopped at once.
  let onSignal = (signal: NodeJS.Signals): void => {
    localRedis?.kill();
    process.stderr.write(`veer: ${signal} while starting; stopped\n`);
    process.exit(1);
  };
  process.on('SIGTERM', (s) => onSignal(s));
  process.on('SIGINT', (s) => onSignal(s));
  const env = { ...process.env };
  try {
    if (!env.REDIS_URL) {
      localRedis = await startLocalRedis(join(env.DATA_DIR ?? './data', 'redis'));
      env.REDIS_URL = localRedis.url;
    }
    const apiConfig = loadApiConfig(env);
    const workerConfig = loadWorkerConfig(env);
    const logger = createLogger('veer', apiConfig.LOG_LEVEL);
    if (localRedis) logger.info({ url: localRedis.url }, 'private redis-server started');
    const { worker, sink } = await startWorkerFromConfig(workerConfig, logger);
    const api = await startApiServer(apiConfig, logger);
    process.stderr.write(`veer: API on ${api.url} (OpenAPI at ${api.url}/openapi.json), 1 worker, Redis ${apiConfig.REDIS_URL}\n`);
    process.stderr.write(existsSync(CONSOLE_DIST_DIR)
      ? `veer: console at ${api.url}/console/\n`
      : 'veer: the console is not built (run `npm run build`); the API works without it\n');
    let stopping = false;
    onSignal = (signal) => {
      if (stopping) return;
      stopping = true;
      process.stderr.write(`veer: ${signal}: stopping (API, worker, ${localRedis ? 'private Redis' : 'connections'})\n`);
      setTimeout(() => {
        process.stderr.write('veer: stop took too long; exiting\n');
        localRedis?.kill();
        process.exit(1);
      }, STOP_LIMIT_MS).unref();
      stopAll(api, worker, sink, localRedis, (m) => process.stderr.write(`veer: ${m}\n`))
        .then(() => process.exit(0), (e: unknown) => {
          process.stderr.write(`veer: error while stopping: ${e instanceof Error ? e.message : String(e)}\n`);
          localRedis?.kill();
          process.exit(1);
        });
    };
  } catch (e) {
    await localRedis?.stop();
    const message = e instanceof ConfigError || e instanceof Error ? e.message : String(e);
    process.stderr.write(`veer serve: ${message}\n`);
    process.exit(e instanceof ConfigError ? 2 : 1);
  }
}

void main();

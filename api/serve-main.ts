/**
 * `npm run serve`: API + one worker + (when REDIS_URL is unset) a private redis-server, all on this machine.
 * For trying veer out or a single-machine install; production runs `npm run api` and `npm run worker`
 * separately (see docker-compose.yml).
 */
import { join } from 'node:path';
import {
  ConfigError, createLogger, loadWorkerConfig, startLocalRedis, startWorkerFromConfig, type LocalRedis,
} from '../queue/index.ts';
import { loadApiConfig } from './config.ts';
import { startApiServer } from './server.ts';

async function main(): Promise<void> {
  let localRedis: LocalRedis | null = null;
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
    const stop = (): void => {
      api.close().then(() => worker.close()).then(() => sink.close()).then(() => localRedis?.stop())
        .then(() => process.exit(0), () => process.exit(1));
    };
    process.on('SIGTERM', stop);
    process.on('SIGINT', stop);
  } catch (e) {
    await localRedis?.stop();
    const message = e instanceof ConfigError || e instanceof Error ? e.message : String(e);
    process.stderr.write(`veer serve: ${message}\n`);
    process.exit(e instanceof ConfigError ? 2 : 1);
  }
}

void main();

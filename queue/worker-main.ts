/**
 * `npm run worker`: one worker process. Configuration from the environment (see README "Service");
 * SIGTERM/SIGINT stop taking jobs and let running ones finish (a second signal forces).
 */
import { ConfigError } from '../contract/env-config.ts';
import { createLogger } from './config/logger.ts';
import { loadWorkerConfig } from './config/worker-config.ts';
import { startWorkerFromConfig } from './worker/start-from-config.ts';

async function main(): Promise<void> {
  let config;
  try {
    config = loadWorkerConfig();
  } catch (e) {
    if (e instanceof ConfigError) {
      process.stderr.write(`veer worker: ${e.message}\n`);
      process.exit(2);
    }
    throw e;
  }
  const logger = createLogger('veer-worker', config.LOG_LEVEL);
  const { worker, sink } = await startWorkerFromConfig(config, logger);
  let stopping = false;
  const stop = (signal: string): void => {
    if (stopping) { logger.warn({ signal }, 'forced stop'); process.exit(1); }
    stopping = true;
    logger.info({ signal }, 'stopping: finishing running jobs');
    worker.close().then(() => sink.close()).then(() => process.exit(0), (err: unknown) => {
      logger.error({ err }, 'error while stopping');
      process.exit(1);
    });
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
}

main().catch((err: unknown) => {
  process.stderr.write(`veer worker: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(err instanceof ConfigError ? 2 : 1); // e.g. a VEER_LEAP_SECONDS file that fails its checks
});

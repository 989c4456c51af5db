/** `npm run api`: the HTTP API. Configuration from the environment (see README "Service"). */
import { ConfigError, createLogger } from '../queue/index.ts';
import { loadApiConfig } from './config.ts';
import { startApiServer } from './server.ts';

async function main(): Promise<void> {
  let config;
  try {
    config = loadApiConfig();
  } catch (e) {
    if (e instanceof ConfigError) { process.stderr.write(`veer api: ${e.message}\n`); process.exit(2); }
    throw e;
  }
  const logger = createLogger('veer-api', config.LOG_LEVEL);
  const api = await startApiServer(config, logger);
  const stop = (signal: string): void => {
    logger.info({ signal }, 'stopping');
    api.close().then(() => process.exit(0), () => process.exit(1));
  };
  process.on('SIGTERM', () => stop('SIGTERM'));
  process.on('SIGINT', () => stop('SIGINT'));
}

main().catch((err: unknown) => {
  process.stderr.write(`veer api: ${err instanceof Error ? err.message : String(err)}\n`);
  process.exit(err instanceof ConfigError ? 2 : 1); // e.g. a VEER_LEAP_SECONDS file that fails its checks
});

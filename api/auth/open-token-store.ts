/** Opens the token store beside the archive: PostgreSQL when a database URL is set, else `tokens.sqlite` in the data folder. */
import { join } from 'node:path';
import { PostgresTokenStore } from './postgres-token-store.ts';
import { SqliteTokenStore } from './sqlite-token-store.ts';
import type { TokenStore } from './token-store.ts';

export interface OpenTokenStoreOptions {
  /** @defaultValue process.env.DATABASE_URL */
  databaseUrl?: string;
  /** @defaultValue process.env.DATA_DIR ?? './data' */
  dataDir?: string;
}

export const SQLITE_TOKENS_FILE = 'tokens.sqlite';

export async function openTokenStore(options: OpenTokenStoreOptions = {}): Promise<TokenStore> {
  const databaseUrl = options.databaseUrl ?? process.env.DATABASE_URL;
  if (databaseUrl) return new PostgresTokenStore(databaseUrl).open();
  return new SqliteTokenStore(join(options.dataDir ?? process.env.DATA_DIR ?? './data', SQLITE_TOKENS_FILE));
}

/** Chooses and opens the store: PostgreSQL when a database URL is given, else the SQLite file in the data folder. */
import { join } from 'node:path';
import { PostgresArchive } from './postgres/postgres-archive.ts';
import { SqliteArchive } from './sqlite/sqlite-archive.ts';
import type { PlanArchive } from '../contract/archive-types.ts';

export interface OpenArchiveOptions {
  /** postgres://… — when set, the PostgreSQL store is used. @defaultValue process.env.DATABASE_URL */
  databaseUrl?: string;
  /** Folder of the SQLite file `archive.sqlite`. @defaultValue process.env.DATA_DIR ?? './data' */
  dataDir?: string;
  now?: () => Date;
}

/** Name of the SQLite archive file inside the data folder. */
export const SQLITE_ARCHIVE_FILE = 'archive.sqlite';

/** Opens the archive and runs its schema migrations; resolves once it is ready to use. */
export async function openArchive(options: OpenArchiveOptions = {}): Promise<PlanArchive> {
  const databaseUrl = options.databaseUrl ?? process.env.DATABASE_URL;
  if (databaseUrl) return new PostgresArchive({ connectionString: databaseUrl, now: options.now }).open();
  const dataDir = options.dataDir ?? process.env.DATA_DIR ?? './data';
  return new SqliteArchive({ file: join(dataDir, SQLITE_ARCHIVE_FILE), now: options.now });
}

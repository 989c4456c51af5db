/** Opening each store for the conformance suite, with raw SQL access for the tamper tests. */
import Database from 'better-sqlite3';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import pg from 'pg';
import { PostgresArchive, SqliteArchive, verifyPostgresReadOnly, verifySqliteReadOnly, type PlanArchive, type VerifyOptions, type VerifyReport } from '../../archive/index.ts';
import type { TestPostgres } from '../harness/postgres.ts';

export interface StoreHandle {
  /** What a child process needs to open the same store: `sqlite:<file>` or the PostgreSQL URL. */
  location: string;
  open(now?: () => Date): Promise<PlanArchive>;
  /** Runs one SQL statement directly against the database (bypassing the archive). */
  sql(statement: string): Promise<void>;
  /** SQL that removes the append-only triggers (what someone editing the database by hand would do first). */
  dropGuardsSql: string[];
  /** The auditor's read-only verification (what `veer verify --data-dir | --database-url` runs). */
  verifyReadOnly(options?: VerifyOptions): Promise<VerifyReport>;
  dispose(): Promise<void>;
}

export interface StoreFactory {
  name: string;
  create(): Promise<StoreHandle>;
}

export function sqliteFactory(): StoreFactory {
  return {
    name: 'SQLite',
    async create() {
      const dir = mkdtempSync(join(tmpdir(), 'veer-archive-'));
      const file = join(dir, 'archive.sqlite');
      return {
        location: `sqlite:${file}`,
        open: async (now) => new SqliteArchive({ file, now }),
        sql: async (statement) => {
          const db = new Database(file);
          try { db.exec(statement); } finally { db.close(); }
        },
        dropGuardsSql: ['DROP TRIGGER archive_entries_no_update', 'DROP TRIGGER archive_entries_no_delete'],
        verifyReadOnly: (options) => verifySqliteReadOnly(dir, options),
        dispose: async () => rmSync(dir, { recursive: true, force: true }),
      };
    },
  };
}

export function postgresFactory(server: () => TestPostgres): StoreFactory {
  return {
    name: 'PostgreSQL',
    async create() {
      const url = await server().freshDatabase();
      return {
        location: url,
        open: (now) => new PostgresArchive({ connectionString: url, now }).open(),
        sql: async (statement) => {
          const client = new pg.Client({ connectionString: url });
          await client.connect();
          try { await client.query(statement); } finally { await client.end(); }
        },
        dropGuardsSql: ['DROP TRIGGER archive_entries_no_change ON archive_entries'],
        verifyReadOnly: (options) => verifyPostgresReadOnly(url, options),
        dispose: async () => undefined,
      };
    },
  };
}

/** Opens the store named by a location string (used by child processes). */
export async function openLocation(location: string): Promise<PlanArchive> {
  if (location.startsWith('sqlite:')) return new SqliteArchive({ file: location.slice('sqlite:'.length) });
  return new PostgresArchive({ connectionString: location }).open();
}

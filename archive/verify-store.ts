/**
 * Read-only verification of a store for auditors (`veer verify --data-dir | --database-url`): opens what is
 * there without creating or migrating anything, so a mistyped folder is an error rather than a fresh, empty
 * and trivially sound archive, and the store under audit is left exactly as found.
 */
import Database from 'better-sqlite3';
import { existsSync } from 'node:fs';
import { join, resolve } from 'node:path';
import pg from 'pg';
import { ArchiveNotFoundError } from './errors.ts';
import { SQLITE_ARCHIVE_FILE } from './open-archive.ts';
import { entryFromRow, planFromRow } from './rows.ts';
import type { VerifyReport } from './types.ts';
import { verifySource } from './verify.ts';

type Row = Record<string, unknown>;

/** Verifies the SQLite archive in `dataDir` read-only; ArchiveNotFoundError (naming --data-dir) if it is not there. */
export async function verifySqliteReadOnly(dataDir: string): Promise<VerifyReport> {
  const file = join(dataDir, SQLITE_ARCHIVE_FILE);
  if (!existsSync(file)) {
    throw new ArchiveNotFoundError(`--data-dir ${dataDir}: no archive file ${resolve(file)} (check the folder name; nothing was created)`);
  }
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const table = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name = 'archive_entries'").get();
    if (!table) throw new ArchiveNotFoundError(`--data-dir ${dataDir}: ${resolve(file)} holds no archive tables`);
    db.exec('BEGIN DEFERRED');
    try {
      return await verifySource({
        head: async () => {
          const row = db.prepare('SELECT sequence, hash FROM archive_head WHERE id = 1').get() as Row;
          return { sequence: Number(row.sequence), hash: String(row.hash) };
        },
        page: async (from, limit) => (db.prepare('SELECT * FROM archive_entries WHERE sequence >= ? ORDER BY sequence LIMIT ?')
          .all(from, limit) as Row[]).map(entryFromRow),
        plans: async () => (db.prepare('SELECT * FROM archive_plans').all() as Row[]).map(planFromRow),
      });
    } finally {
      db.exec('COMMIT');
    }
  } finally {
    db.close();
  }
}

/** Verifies the PostgreSQL archive read-only in one snapshot; ArchiveNotFoundError (naming --database-url) if it has no archive. */
export async function verifyPostgresReadOnly(connectionString: string): Promise<VerifyReport> {
  const client = new pg.Client({ connectionString });
  await client.connect();
  try {
    await client.query('BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY');
    const found = (await client.query("SELECT to_regclass('archive_entries') IS NOT NULL AS present")).rows[0] as Row;
    if (found.present !== true) throw new ArchiveNotFoundError('--database-url: that database holds no archive tables (nothing was created)');
    const report = await verifySource({
      head: async () => {
        const row = (await client.query('SELECT sequence, hash FROM archive_head WHERE id = 1')).rows[0] as Row;
        return { sequence: Number(row.sequence), hash: String(row.hash) };
      },
      page: async (from, limit) => (await client.query('SELECT * FROM archive_entries WHERE sequence >= $1 ORDER BY sequence LIMIT $2', [from, limit]))
        .rows.map(entryFromRow),
      plans: async () => (await client.query('SELECT * FROM archive_plans')).rows.map(planFromRow),
    });
    await client.query('COMMIT');
    return report;
  } catch (error) {
    await client.query('ROLLBACK').catch(() => undefined);
    throw error;
  } finally {
    await client.end();
  }
}

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
import { inTransaction } from './postgres/pg-transaction.ts';
import { postgresVerifySource } from './postgres/postgres-archive.ts';
import { sqliteVerifySource } from './sqlite/sqlite-archive.ts';
import type { VerifyOptions, VerifyReport } from '../contract/archive-types.ts';
import { verifySource } from './verify.ts';

type Row = Record<string, unknown>;

/** Verifies the SQLite archive in `dataDir` read-only; ArchiveNotFoundError (naming --data-dir) if it is not there. */
export async function verifySqliteReadOnly(dataDir: string, options: VerifyOptions = {}): Promise<VerifyReport> {
  const file = join(dataDir, SQLITE_ARCHIVE_FILE);
  if (!existsSync(file)) {
    throw new ArchiveNotFoundError(`--data-dir ${dataDir}: no archive file ${resolve(file)} (check the folder name; nothing was created)`);
  }
  return verifySqliteFileReadOnly(file, options, `--data-dir ${dataDir}`);
}

/** Verifies the SQLite archive file `file` read-only; ArchiveNotFoundError (naming `label`) when it holds no archive. */
export async function verifySqliteFileReadOnly(file: string, options: VerifyOptions = {}, label = file): Promise<VerifyReport> {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const table = db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name = 'archive_entries'").get();
    if (!table) throw new ArchiveNotFoundError(`${label}: ${resolve(file)} holds no archive tables`);
    db.exec('BEGIN DEFERRED');
    try {
      return await verifySource(sqliteVerifySource(db), options);
    } finally {
      db.exec('COMMIT');
    }
  } finally {
    db.close();
  }
}

/** Verifies the PostgreSQL archive read-only in one snapshot; ArchiveNotFoundError (naming --database-url) if it has no archive. */
export async function verifyPostgresReadOnly(connectionString: string, options: VerifyOptions = {}): Promise<VerifyReport> {
  const client = new pg.Client({ connectionString });
  await client.connect();
  try {
    return await inTransaction(client, 'BEGIN ISOLATION LEVEL REPEATABLE READ READ ONLY', async () => {
      const found = (await client.query("SELECT to_regclass('archive_entries') IS NOT NULL AS present")).rows[0] as Row;
      if (found.present !== true) throw new ArchiveNotFoundError('--database-url: that database holds no archive tables (nothing was created)');
      return verifySource(postgresVerifySource(client), options);
    });
  } finally {
    await client.end();
  }
}

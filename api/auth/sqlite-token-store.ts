/** Token store in a SQLite file (WAL), next to the archive in the data folder. */
import type Database from 'better-sqlite3';
import { migrateSqlite, openSqliteDatabase, type Migration } from '../../archive/index.ts';
import { parseNewToken } from './token-input.ts';
import { generateTokenId, generateTokenSecret, hashTokenSecret } from './token-secret.ts';
import { UNSTATED_ACTOR, type TokenRecord, type TokenStore } from './token-store.ts';
import type { Identity, Role } from './roles.ts';

const MIGRATIONS: readonly Migration[] = [{
  version: 1,
  name: 'api tokens (hashes only)',
  sql: `CREATE TABLE api_tokens (
    id TEXT PRIMARY KEY,
    name TEXT NOT NULL,
    roles TEXT NOT NULL,
    token_hash TEXT NOT NULL UNIQUE,
    created_at TEXT NOT NULL,
    revoked_at TEXT
  );`,
}, {
  version: 2,
  name: 'api tokens: who created and who revoked each',
  sql: 'ALTER TABLE api_tokens ADD COLUMN created_by TEXT; ALTER TABLE api_tokens ADD COLUMN revoked_by TEXT;',
}];

type Row = Record<string, unknown>;
export const tokenFromRow = (row: Row): TokenRecord => ({
  id: String(row.id), name: String(row.name), roles: JSON.parse(String(row.roles)) as Role[],
  createdAt: String(row.created_at), revokedAt: row.revoked_at === null || row.revoked_at === undefined ? null : String(row.revoked_at),
  createdBy: row.created_by === null || row.created_by === undefined ? null : String(row.created_by),
  revokedBy: row.revoked_by === null || row.revoked_by === undefined ? null : String(row.revoked_by),
});

export class SqliteTokenStore implements TokenStore {
  private readonly db: Database.Database;
  constructor(file: string) {
    this.db = openSqliteDatabase(file);
    migrateSqlite(this.db, 'auth_schema_migrations', MIGRATIONS);
  }
  async add(name: string, roles: Role[], createdBy: string = UNSTATED_ACTOR): Promise<{ token: string; record: TokenRecord }> {
    const valid = parseNewToken({ name, roles });
    const token = generateTokenSecret();
    const record: TokenRecord = { id: generateTokenId(), name: valid.name, roles: valid.roles, createdAt: new Date().toISOString(), revokedAt: null,
      createdBy, revokedBy: null };
    this.db.prepare('INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at, created_by) VALUES (?, ?, ?, ?, ?, NULL, ?)')
      .run(record.id, record.name, JSON.stringify(record.roles), hashTokenSecret(token), record.createdAt, createdBy);
    return { token, record };
  }
  async list(): Promise<TokenRecord[]> {
    return (this.db.prepare('SELECT * FROM api_tokens ORDER BY created_at, id').all() as Row[]).map(tokenFromRow);
  }
  async revoke(id: string, revokedBy: string = UNSTATED_ACTOR): Promise<TokenRecord | undefined> {
    this.db.prepare('UPDATE api_tokens SET revoked_at = ?, revoked_by = ? WHERE id = ? AND revoked_at IS NULL').run(new Date().toISOString(), revokedBy, id);
    const row = this.db.prepare('SELECT * FROM api_tokens WHERE id = ?').get(id) as Row | undefined;
    return row ? tokenFromRow(row) : undefined;
  }
  async identify(token: string): Promise<Identity | undefined> {
    const row = this.db.prepare('SELECT * FROM api_tokens WHERE token_hash = ? AND revoked_at IS NULL').get(hashTokenSecret(token)) as Row | undefined;
    if (!row) return undefined;
    const record = tokenFromRow(row);
    return { name: record.name, roles: record.roles, tokenId: record.id };
  }
  async close(): Promise<void> {
    this.db.close();
  }
}

/** Token store in a SQLite file (WAL), next to the archive in the data folder. */
import type Database from 'better-sqlite3';
import { migrateSqlite, openSqliteDatabase, type Migration } from '../../archive/index.ts';
import { parseNewToken } from './token-input.ts';
import { generateTokenId, generateTokenSecret, hashTokenSecret } from './token-secret.ts';
import type { TokenRecord, TokenStore } from './token-store.ts';
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
}];

type Row = Record<string, unknown>;
export const tokenFromRow = (row: Row): TokenRecord => ({
  id: String(row.id), name: String(row.name), roles: JSON.parse(String(row.roles)) as Role[],
  createdAt: String(row.created_at), revokedAt: row.revoked_at === null || row.revoked_at === undefined ? null : String(row.revoked_at),
});

export class SqliteTokenStore implements TokenStore {
  private readonly db: Database.Database;
  constructor(file: string) {
    this.db = openSqliteDatabase(file);
    migrateSqlite(this.db, 'auth_schema_migrations', MIGRATIONS);
  }
  async add(name: string, roles: Role[]): Promise<{ token: string; record: TokenRecord }> {
    const valid = parseNewToken({ name, roles });
    const token = generateTokenSecret();
    const record: TokenRecord = { id: generateTokenId(), name: valid.name, roles: valid.roles, createdAt: new Date().toISOString(), revokedAt: null };
    this.db.prepare('INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at) VALUES (?, ?, ?, ?, ?, NULL)')
      .run(record.id, record.name, JSON.stringify(record.roles), hashTokenSecret(token), record.createdAt);
    return { token, record };
  }
  async list(): Promise<TokenRecord[]> {
    return (this.db.prepare('SELECT * FROM api_tokens ORDER BY created_at, id').all() as Row[]).map(tokenFromRow);
  }
  async revoke(id: string): Promise<TokenRecord | undefined> {
    this.db.prepare('UPDATE api_tokens SET revoked_at = ? WHERE id = ? AND revoked_at IS NULL').run(new Date().toISOString(), id);
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

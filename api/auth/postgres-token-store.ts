/** Token store in PostgreSQL (same database as the archive, its own table and migration history). */
import pg from 'pg';
import { migratePostgres, type PgMigration } from '../../archive/index.ts';
import { tokenFromRow } from './sqlite-token-store.ts';
import { parseNewToken } from './token-input.ts';
import { generateTokenId, generateTokenSecret, hashTokenSecret } from './token-secret.ts';
import { UNSTATED_ACTOR, type TokenRecord, type TokenStore } from './token-store.ts';
import type { Identity, Role } from './roles.ts';

const MIGRATIONS: readonly PgMigration[] = [{
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
const MIGRATION_LOCK_KEY = 7_335_002;

export class PostgresTokenStore implements TokenStore {
  private readonly pool: pg.Pool;
  private readonly ready: Promise<unknown>;
  constructor(connectionString: string) {
    this.pool = new pg.Pool({ connectionString, max: 3 });
    this.ready = migratePostgres(this.pool, 'auth_schema_migrations', MIGRATIONS, MIGRATION_LOCK_KEY);
    this.ready.catch(() => undefined);
  }
  async open(): Promise<this> {
    await this.ready;
    return this;
  }
  async add(name: string, roles: Role[], createdBy: string = UNSTATED_ACTOR): Promise<{ token: string; record: TokenRecord }> {
    await this.ready;
    const valid = parseNewToken({ name, roles });
    const token = generateTokenSecret();
    const record: TokenRecord = { id: generateTokenId(), name: valid.name, roles: valid.roles, createdAt: new Date().toISOString(), revokedAt: null,
      createdBy, revokedBy: null };
    await this.pool.query('INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at, created_by) VALUES ($1, $2, $3, $4, $5, NULL, $6)',
      [record.id, record.name, JSON.stringify(record.roles), hashTokenSecret(token), record.createdAt, createdBy]);
    return { token, record };
  }
  async list(): Promise<TokenRecord[]> {
    await this.ready;
    return (await this.pool.query('SELECT * FROM api_tokens ORDER BY created_at, id')).rows.map(tokenFromRow);
  }
  async revoke(id: string, revokedBy: string = UNSTATED_ACTOR): Promise<TokenRecord | undefined> {
    await this.ready;
    await this.pool.query('UPDATE api_tokens SET revoked_at = $1, revoked_by = $2 WHERE id = $3 AND revoked_at IS NULL', [new Date().toISOString(), revokedBy, id]);
    const row = (await this.pool.query('SELECT * FROM api_tokens WHERE id = $1', [id])).rows[0];
    return row ? tokenFromRow(row) : undefined;
  }
  async identify(token: string): Promise<Identity | undefined> {
    await this.ready;
    const row = (await this.pool.query('SELECT * FROM api_tokens WHERE token_hash = $1 AND revoked_at IS NULL', [hashTokenSecret(token)])).rows[0];
    if (!row) return undefined;
    const record = tokenFromRow(row);
    return { name: record.name, roles: record.roles, tokenId: record.id };
  }
  async close(): Promise<void> {
    await this.ready.catch(() => undefined);
    await this.pool.end();
  }
}

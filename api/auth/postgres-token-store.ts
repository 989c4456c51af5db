/** Token store in PostgreSQL (same database as the archive, its own table and migration history). */
import pg from 'pg';
import { migratePostgres } from '../../archive/index.ts';
import { TOKEN_MIGRATIONS, identityFromRow, newToken, tokenFromRow, tokenInsertValues } from './token-table.ts';
import { hashTokenSecret } from './token-secret.ts';
import { UNSTATED_ACTOR, type TokenRecord, type TokenStore } from './token-store.ts';
import type { Identity, Role } from '../../contract/roles.ts';

const MIGRATION_LOCK_KEY = 7_335_002;

export class PostgresTokenStore implements TokenStore {
  private readonly pool: pg.Pool;
  private readonly ready: Promise<unknown>;
  constructor(connectionString: string) {
    this.pool = new pg.Pool({ connectionString, max: 3 });
    this.ready = migratePostgres(this.pool, 'auth_schema_migrations', TOKEN_MIGRATIONS, MIGRATION_LOCK_KEY);
    this.ready.catch(() => undefined);
  }
  async open(): Promise<this> {
    await this.ready;
    return this;
  }
  async add(name: string, roles: Role[], createdBy: string = UNSTATED_ACTOR): Promise<{ token: string; record: TokenRecord }> {
    await this.ready;
    const { token, record, tokenHash } = newToken(name, roles, createdBy);
    await this.pool.query('INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at, created_by) VALUES ($1, $2, $3, $4, $5, NULL, $6)',
      tokenInsertValues(record, tokenHash));
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
    return row ? identityFromRow(row) : undefined;
  }
  async close(): Promise<void> {
    await this.ready.catch(() => undefined);
    await this.pool.end();
  }
}

/** Token store in a SQLite file (WAL), next to the archive in the data folder. */
import type Database from 'better-sqlite3';
import { migrateSqlite, openSqliteDatabase } from '../../archive/index.ts';
import { TOKEN_MIGRATIONS, identityFromRow, newToken, tokenFromRow, tokenInsertValues, type TokenRow as Row } from './token-table.ts';
import { hashTokenSecret } from './token-secret.ts';
import { UNSTATED_ACTOR, type TokenRecord, type TokenStore } from './token-store.ts';
import type { Identity, Role } from '../../contract/roles.ts';

export class SqliteTokenStore implements TokenStore {
  private readonly db: Database.Database;
  /** Prepared once: every authenticated request looks its token up (preparing per call cost ~4 % of the
   * API's CPU time under the submission benchmark's load). */
  private readonly byHash: Database.Statement;
  constructor(file: string) {
    this.db = openSqliteDatabase(file);
    migrateSqlite(this.db, 'auth_schema_migrations', TOKEN_MIGRATIONS);
    this.byHash = this.db.prepare('SELECT * FROM api_tokens WHERE token_hash = ? AND revoked_at IS NULL');
  }
  async add(name: string, roles: Role[], createdBy: string = UNSTATED_ACTOR): Promise<{ token: string; record: TokenRecord }> {
    const { token, record, tokenHash } = newToken(name, roles, createdBy);
    this.db.prepare('INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at, created_by) VALUES (?, ?, ?, ?, ?, NULL, ?)')
      .run(...tokenInsertValues(record, tokenHash));
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
    const row = this.byHash.get(hashTokenSecret(token)) as Row | undefined;
    return row ? identityFromRow(row) : undefined;
  }
  async close(): Promise<void> {
    this.db.close();
  }
}

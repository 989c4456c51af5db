/** Token store in a SQLite file (WAL), next to the archive in the data folder. */
import type Database from 'better-sqlite3';
import { migrateSqlite, openSqliteDatabase } from '../../archive/index.ts';
import { TOKEN_MIGRATIONS, identityFromRow, newToken, tokenFromRow, tokenInsertValues, type TokenRow as Row } from './token-table.ts';
import { hashTokenSecret } from './token-secret.ts';
import { UNSTATED_ACTOR, type TokenRecord, type TokenStore } from './token-store.ts';
import type { Identity, Role } from '../../contract/roles.ts';

export interface SqliteTokenStoreOptions {
  /** Identities kept in memory at most (the oldest is dropped first); an integer ≥ 1.
   * @defaultValue SQLITE_TOKEN_STORE_DEFAULTS.cachedIdentitiesMax */
  cachedIdentitiesMax?: number;
}

/** A deployment has tens of tokens: the bound only caps memory, it is not meant to be reached. */
export const SQLITE_TOKEN_STORE_DEFAULTS = Object.freeze({ cachedIdentitiesMax: 1024 });

/**
 * Every authenticated request looks its token up, so identities found are kept in memory, keyed by the token's
 * SHA-256 (never the token), while the database is unchanged: `PRAGMA data_version` moves when another
 * connection (the `veer tokens` command, another API process) commits, and this store's own writes clear the
 * map. The connection is this store's alone, so no other in-process writer can go unnoticed. Tokens carry no
 * expiry, so a kept identity depends on nothing else. Unknown and revoked tokens are not kept.
 */
export class SqliteTokenStore implements TokenStore {
  private readonly db: Database.Database;
  /** Prepared once: every authenticated request looks its token up (preparing per call cost ~4 % of the
   * API's CPU time under the submission benchmark's load). */
  private readonly byHash: Database.Statement;
  private readonly dataVersion: Database.Statement;
  private readonly identities = new Map<string, Identity>();
  private readonly cachedIdentitiesMax: number;
  /** data_version when the map was last known valid; null before the first look-up. */
  private seenVersion: unknown = null;
  constructor(file: string, options: SqliteTokenStoreOptions = {}) {
    const max = options.cachedIdentitiesMax ?? SQLITE_TOKEN_STORE_DEFAULTS.cachedIdentitiesMax;
    if (!Number.isInteger(max) || max < 1) throw new Error(`cachedIdentitiesMax: must be an integer ≥ 1 (got ${max})`);
    this.cachedIdentitiesMax = max;
    this.db = openSqliteDatabase(file);
    migrateSqlite(this.db, 'auth_schema_migrations', TOKEN_MIGRATIONS);
    this.byHash = this.db.prepare('SELECT * FROM api_tokens WHERE token_hash = ? AND revoked_at IS NULL');
    this.dataVersion = this.db.prepare('PRAGMA data_version').pluck();
  }
  async add(name: string, roles: Role[], createdBy: string = UNSTATED_ACTOR): Promise<{ token: string; record: TokenRecord }> {
    const { token, record, tokenHash } = newToken(name, roles, createdBy);
    this.db.prepare('INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at, created_by) VALUES (?, ?, ?, ?, ?, NULL, ?)')
      .run(...tokenInsertValues(record, tokenHash));
    this.identities.clear(); // own commits leave data_version as it is
    return { token, record };
  }
  async list(): Promise<TokenRecord[]> {
    return (this.db.prepare('SELECT * FROM api_tokens ORDER BY created_at, id').all() as Row[]).map(tokenFromRow);
  }
  async revoke(id: string, revokedBy: string = UNSTATED_ACTOR): Promise<TokenRecord | undefined> {
    this.db.prepare('UPDATE api_tokens SET revoked_at = ?, revoked_by = ? WHERE id = ? AND revoked_at IS NULL').run(new Date().toISOString(), revokedBy, id);
    this.identities.clear(); // own commits leave data_version as it is
    const row = this.db.prepare('SELECT * FROM api_tokens WHERE id = ?').get(id) as Row | undefined;
    return row ? tokenFromRow(row) : undefined;
  }
  async identify(token: string): Promise<Identity | undefined> {
    const hash = hashTokenSecret(token);
    // The version is read before the row: a row read after it is at least as new, so a revocation committed
    // between the two shows as a moved version on the next call. The other order could keep a revoked row.
    const version = this.dataVersion.get();
    if (version !== this.seenVersion) {
      this.identities.clear();
      this.seenVersion = version;
    }
    const kept = this.identities.get(hash);
    if (kept) return kept;
    const row = this.byHash.get(hash) as Row | undefined;
    if (!row) return undefined;
    const identity = identityFromRow(row);
    Object.freeze(identity.roles); // shared by every request that presents this token
    this.keep(hash, Object.freeze(identity));
    return identity;
  }
  /** Identities held in memory now (for tests). */
  get cachedIdentityCount(): number {
    return this.identities.size;
  }
  async close(): Promise<void> {
    this.identities.clear();
    this.db.close();
  }
  private keep(hash: string, identity: Identity): void {
    if (this.identities.size >= this.cachedIdentitiesMax) {
      const oldest = this.identities.keys().next();
      if (!oldest.done) this.identities.delete(oldest.value);
    }
    this.identities.set(hash, identity);
  }
}

/** The api_tokens table shared by the SQLite and PostgreSQL token stores: its migrations, rows and new records. */
import type { Migration } from '../../archive/index.ts';
import { parseNewToken } from './token-input.ts';
import { generateTokenId, generateTokenSecret, hashTokenSecret } from './token-secret.ts';
import type { TokenRecord } from './token-store.ts';
import type { Identity, Role } from '../../contract/roles.ts';

/** The same SQL serves both dialects (plain TEXT columns); append new versions, never edit a released one. */
export const TOKEN_MIGRATIONS: readonly Migration[] = [{
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

export type TokenRow = Record<string, unknown>;

const textOrNull = (value: unknown): string | null => (value === null || value === undefined ? null : String(value));

export const tokenFromRow = (row: TokenRow): TokenRecord => ({
  id: String(row.id), name: String(row.name), roles: JSON.parse(String(row.roles)) as Role[],
  createdAt: String(row.created_at), revokedAt: textOrNull(row.revoked_at),
  createdBy: textOrNull(row.created_by),
  revokedBy: textOrNull(row.revoked_by),
});

export const identityFromRow = (row: TokenRow): Identity => {
  const record = tokenFromRow(row);
  return { name: record.name, roles: record.roles, tokenId: record.id };
};

/** Validates the input and makes a new token: the secret (shown once), its record, and the hash to store. */
export function newToken(name: string, roles: Role[], createdBy: string): { token: string; record: TokenRecord; tokenHash: string } {
  const valid = parseNewToken({ name, roles });
  const token = generateTokenSecret();
  const record: TokenRecord = { id: generateTokenId(), name: valid.name, roles: valid.roles, createdAt: new Date().toISOString(), revokedAt: null,
    createdBy, revokedBy: null };
  return { token, record, tokenHash: hashTokenSecret(token) };
}

/** Column values for `INSERT INTO api_tokens (id, name, roles, token_hash, created_at, revoked_at, created_by)` with revoked_at NULL. */
export const tokenInsertValues = (record: TokenRecord, tokenHash: string): unknown[] =>
  [record.id, record.name, JSON.stringify(record.roles), tokenHash, record.createdAt, record.createdBy];

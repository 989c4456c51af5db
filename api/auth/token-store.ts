/** Where tokens live: only their hashes, with a name, roles, and creation/revocation times. */
import type { Identity, Role } from '../../contract/roles.ts';

export interface TokenRecord {
  id: string;
  name: string;
  roles: Role[];
  /** ISO UTC */
  createdAt: string;
  /** ISO UTC, or null while valid. */
  revokedAt: string | null;
  /** Who created it (an admin's identity name, or `cli:user@host`); null for tokens made before this was recorded. */
  createdBy: string | null;
  /** Who revoked it; null while valid (or revoked before this was recorded). */
  revokedBy: string | null;
}

/** Recorded when the caller does not say who acts (kept visible rather than left empty). */
export const UNSTATED_ACTOR = 'unstated';

export interface TokenStore {
  /** Creates a token; the returned `token` is the secret, shown once and not kept. `createdBy` is kept with it. */
  add(name: string, roles: Role[], createdBy?: string): Promise<{ token: string; record: TokenRecord }>;
  list(): Promise<TokenRecord[]>;
  /** Revokes by id; resolves to the record, or undefined when no such token exists. */
  revoke(id: string, revokedBy?: string): Promise<TokenRecord | undefined>;
  /** The identity of a presented secret, or undefined if unknown or revoked. */
  identify(token: string): Promise<Identity | undefined>;
  close(): Promise<void>;
}

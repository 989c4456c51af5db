/** Where tokens live: only their hashes, with a name, roles, and creation/revocation times. */
import type { Identity, Role } from './roles.ts';

export interface TokenRecord {
  id: string;
  name: string;
  roles: Role[];
  /** ISO UTC */
  createdAt: string;
  /** ISO UTC, or null while valid. */
  revokedAt: string | null;
}

export interface TokenStore {
  /** Creates a token; the returned `token` is the secret, shown once and not kept. */
  add(name: string, roles: Role[]): Promise<{ token: string; record: TokenRecord }>;
  list(): Promise<TokenRecord[]>;
  /** Revokes by id; resolves to the record, or undefined when no such token exists. */
  revoke(id: string): Promise<TokenRecord | undefined>;
  /** The identity of a presented secret, or undefined if unknown or revoked. */
  identify(token: string): Promise<Identity | undefined>;
  close(): Promise<void>;
}

/**
 * Token secrets. A token is `veer_` + 32 random bytes (256 bits) in base64url. Only its SHA-256 is stored.
 * A plain, fast hash is enough here (unlike for passwords): with 256 bits of entropy no guessing or
 * dictionary attack on a leaked hash is feasible, so a slow salted KDF (scrypt, argon2) would add cost to
 * every request without adding protection; and a deterministic hash lets the store look a token up by an
 * index. Lookup by hash also means the presented secret is never compared byte by byte.
 */
import { randomBytes } from 'node:crypto';
import { sha256Hex } from '../../archive/index.ts';

export const TOKEN_PREFIX = 'veer_';

/** A new random token (shown to the operator once, never stored). */
export function generateTokenSecret(): string {
  return TOKEN_PREFIX + randomBytes(32).toString('base64url');
}

/** SHA-256 hex of the token's UTF-8 bytes: the only form kept in the store. */
export function hashTokenSecret(token: string): string {
  return sha256Hex(token);
}

/** A short public id for listing and revoking (`tok_` + 12 hex digits). */
export function generateTokenId(): string {
  return 'tok_' + randomBytes(6).toString('hex');
}

/** Identities and roles for api/: bearer tokens stored as hashes, `authenticate` and `requireRoles`. */
export { ROLES, roleSchema, sameIdentityName, tokenNameSchema, type Identity, type Role } from '../../contract/roles.ts';
export type { TokenRecord, TokenStore } from './token-store.ts';
export { SqliteTokenStore, SQLITE_TOKEN_STORE_DEFAULTS, type SqliteTokenStoreOptions } from './sqlite-token-store.ts';
export { PostgresTokenStore } from './postgres-token-store.ts';
export { openTokenStore, SQLITE_TOKENS_FILE, type OpenTokenStoreOptions } from './open-token-store.ts';
export { authenticate, identityOf, requireRoles, type RoleGuard } from './middleware.ts';
export { generateTokenSecret, hashTokenSecret, TOKEN_PREFIX } from './token-secret.ts';
export { newTokenSchema, parseNewToken } from './token-input.ts';
export { refusedTokenLimit, type RefusedTokenLimitOptions } from './refused-token-limit.ts';

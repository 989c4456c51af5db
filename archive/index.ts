/** Public face of archive/: other rooms import from here only. */
export * from '../contract/archive-types.ts';
export { ArchiveConflictError, ArchiveInputError, ArchiveIntegrityError, ArchiveNotFoundError } from './errors.ts';
export { canonicalJson } from '../contract/canonical-json.ts';
export { canonicalHash, sha256Hex, entryHash, entryHeader, headerHash, payloadHash, ChainVerifier, type EntryHeader } from './chain.ts';
export type { ManeuverPlanIsArchivable } from './plan-compat.ts';
export { openArchive, SQLITE_ARCHIVE_FILE, type OpenArchiveOptions } from './open-archive.ts';
export { verifyPostgresReadOnly, verifySqliteReadOnly } from './verify-store.ts';
export { SqliteArchive, migrateSqlite, openSqliteDatabase, type SqliteArchiveOptions } from './sqlite/sqlite-archive.ts';
export { PostgresArchive, migratePostgres, type PostgresArchiveOptions } from './postgres/postgres-archive.ts';
export { type Migration } from './sqlite/sqlite-migrations.ts';
export { type PgMigration } from './postgres/postgres-migrations.ts';
export { buildPlanBundle, checkPlanBundle, BUNDLE_FORMAT, BUNDLE_HEAD_ADVICE, HASHING_RULES, type PlanBundle, type BundleCheck, type BundleOptions } from './bundle.ts';

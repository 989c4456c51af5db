/** Versioned schema of the PostgreSQL archive. Append new versions; never edit a released one. */
import { archiveSchemaV1 } from '../archive-schema-v1.ts';
import type { Migration } from '../migrations.ts';

/** Same shape as the SQLite store's migrations. */
export type PgMigration = Migration;

export const POSTGRES_ARCHIVE_MIGRATIONS: readonly PgMigration[] = [
  {
    version: 1,
    name: 'archive entries, head, plan and job projections',
    // A statement trigger as well: TRUNCATE fires no row triggers in PostgreSQL.
    sql: archiveSchemaV1({
      sequence: 'BIGINT',
      boolean: 'BOOLEAN',
      appendOnlyTriggers: `CREATE FUNCTION archive_entries_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN RAISE EXCEPTION 'archive entries are append-only'; END $$;
CREATE TRIGGER archive_entries_no_change BEFORE UPDATE OR DELETE ON archive_entries
  FOR EACH ROW EXECUTE FUNCTION archive_entries_append_only();
CREATE TRIGGER archive_entries_no_truncate BEFORE TRUNCATE ON archive_entries
  FOR EACH STATEMENT EXECUTE FUNCTION archive_entries_append_only();`,
    }),
  },
];

/** Versioned schema of the SQLite archive. Append new versions; never edit a released one. */
import { archiveSchemaV1 } from '../archive-schema-v1.ts';
import type { Migration } from '../migrations.ts';

export type { Migration };

export const SQLITE_ARCHIVE_MIGRATIONS: readonly Migration[] = [
  {
    version: 1,
    name: 'archive entries, head, plan and job projections',
    // INTEGER PRIMARY KEY makes the sequence SQLite's row id; flags are 0/1 integers (SQLite has no boolean).
    sql: archiveSchemaV1({
      sequence: 'INTEGER',
      boolean: 'INTEGER',
      appendOnlyTriggers: `CREATE TRIGGER archive_entries_no_update BEFORE UPDATE ON archive_entries
  BEGIN SELECT RAISE(ABORT, 'archive entries are append-only'); END;
CREATE TRIGGER archive_entries_no_delete BEFORE DELETE ON archive_entries
  BEGIN SELECT RAISE(ABORT, 'archive entries are append-only'); END;`,
    }),
  },
];

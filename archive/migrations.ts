/** What both stores' migration runners share: the migration shape, the history table, which ones are still to apply. */

/** One schema step. Append new versions to a store's list; never edit a released one. */
export interface Migration { version: number; name: string; sql: string }

/** Column list of the table that records applied migrations (same in both dialects). */
export const MIGRATION_HISTORY_COLUMNS = '(version INTEGER PRIMARY KEY, name TEXT NOT NULL, applied_at TEXT NOT NULL)';

/** The migrations whose versions are not among those applied, in list order. */
export function pendingMigrations(migrations: readonly Migration[], applied: ReadonlySet<number>): Migration[] {
  return migrations.filter((m) => !applied.has(m.version));
}

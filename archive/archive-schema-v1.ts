/**
 * Version 1 of the archive's schema, written once for both stores: the tables, indexes and the head row are
 * the same SQL, and only the column types for sequence numbers and flags and the append-only triggers differ
 * per dialect. Released text: each store's migration list must keep producing exactly what it applied.
 */

/** What differs between the SQLite and PostgreSQL forms of the schema. */
export interface ArchiveSqlDialect {
  /** Column type of entry sequence numbers (64-bit). */
  sequence: string;
  /** Column type of true/false flags. */
  boolean: string;
  /** Statements that refuse any change to archive_entries rows (no trailing newline). */
  appendOnlyTriggers: string;
}

/** The SQL of schema version 1 in dialect `d`. */
export function archiveSchemaV1(d: ArchiveSqlDialect): string {
  return `
CREATE TABLE archive_entries (
  sequence ${d.sequence} PRIMARY KEY,
  at TEXT NOT NULL,
  actor TEXT NOT NULL,
  kind TEXT NOT NULL,
  plan_id TEXT,
  job_id TEXT,
  payload TEXT NOT NULL,
  previous_hash TEXT NOT NULL,
  hash TEXT NOT NULL
);
CREATE INDEX archive_entries_plan ON archive_entries(plan_id);
CREATE INDEX archive_entries_job ON archive_entries(job_id);
${d.appendOnlyTriggers}
CREATE TABLE archive_head (
  id INTEGER PRIMARY KEY CHECK (id = 1),
  sequence ${d.sequence} NOT NULL,
  hash TEXT NOT NULL
);
INSERT INTO archive_head (id, sequence, hash) VALUES (1, 0, '${'0'.repeat(64)}');
CREATE TABLE archive_jobs (
  job_id TEXT PRIMARY KEY,
  submitted_by TEXT,
  problem_hash TEXT,
  state TEXT NOT NULL,
  plan_id TEXT,
  last_sequence ${d.sequence} NOT NULL
);
CREATE TABLE archive_plans (
  plan_id TEXT PRIMARY KEY,
  job_id TEXT NOT NULL UNIQUE,
  spacecraft_name TEXT NOT NULL,
  target_set_key TEXT NOT NULL,
  state TEXT NOT NULL,
  converged ${d.boolean} NOT NULL,
  cross_check_passed ${d.boolean} NOT NULL,
  caveat_codes TEXT NOT NULL,
  submitted_by TEXT NOT NULL,
  problem_hash TEXT NOT NULL,
  software_version TEXT NOT NULL,
  proposed_at TEXT NOT NULL,
  proposed_sequence ${d.sequence} NOT NULL,
  decided_at TEXT,
  decided_by TEXT,
  superseded_by TEXT,
  last_sequence ${d.sequence} NOT NULL
);
CREATE INDEX archive_plans_key ON archive_plans(spacecraft_name, target_set_key, state);
CREATE INDEX archive_plans_state ON archive_plans(state, proposed_at);
`;
}

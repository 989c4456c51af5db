/** Versioned schema of the PostgreSQL archive. Append new versions; never edit a released one. */
import type { Migration } from '../migrations.ts';

/** Same shape as the SQLite store's migrations. */
export type PgMigration = Migration;

export const POSTGRES_ARCHIVE_MIGRATIONS: readonly PgMigration[] = [
  {
    version: 1,
    name: 'archive entries, head, plan and job projections',
    sql: `
CREATE TABLE archive_entries (
  sequence BIGINT PRIMARY KEY,
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
CREATE FUNCTION archive_entries_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN RAISE EXCEPTION 'archive entries are append-only'; END $$;
CREATE TRIGGER archive_entries_no_change BEFORE UPDATE OR DELETE ON archive_entries
  FOR EACH ROW EXECUTE FUNCTION archive_entries_append_only();
CREATE TRIGGER archive_entries_no_truncate BEFORE TRUNCATE ON archive_entries
  FOR EACH STATEMENT EXECUTE FUNCTION archive_entries_append_only();
CREATE TABLE archive_head (
  id INTEGER PRIMARY KEY CHECK (id = 1),
  sequence BIGINT NOT NULL,
  hash TEXT NOT NULL
);
INSERT INTO archive_head (id, sequence, hash) VALUES (1, 0, '${'0'.repeat(64)}');
CREATE TABLE archive_jobs (
  job_id TEXT PRIMARY KEY,
  submitted_by TEXT,
  problem_hash TEXT,
  state TEXT NOT NULL,
  plan_id TEXT,
  last_sequence BIGINT NOT NULL
);
CREATE TABLE archive_plans (
  plan_id TEXT PRIMARY KEY,
  job_id TEXT NOT NULL UNIQUE,
  spacecraft_name TEXT NOT NULL,
  target_set_key TEXT NOT NULL,
  state TEXT NOT NULL,
  converged BOOLEAN NOT NULL,
  cross_check_passed BOOLEAN NOT NULL,
  caveat_codes TEXT NOT NULL,
  submitted_by TEXT NOT NULL,
  problem_hash TEXT NOT NULL,
  software_version TEXT NOT NULL,
  proposed_at TEXT NOT NULL,
  proposed_sequence BIGINT NOT NULL,
  decided_at TEXT,
  decided_by TEXT,
  superseded_by TEXT,
  last_sequence BIGINT NOT NULL
);
CREATE INDEX archive_plans_key ON archive_plans(spacecraft_name, target_set_key, state);
CREATE INDEX archive_plans_state ON archive_plans(state, proposed_at);
`,
  },
];

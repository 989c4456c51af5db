/** Versioned schema of the SQLite archive. Append new versions; never edit a released one. */
import type { Migration } from '../migrations.ts';

export type { Migration };

export const SQLITE_ARCHIVE_MIGRATIONS: readonly Migration[] = [
  {
    version: 1,
    name: 'archive entries, head, plan and job projections',
    sql: `
CREATE TABLE archive_entries (
  sequence INTEGER PRIMARY KEY,
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
CREATE TRIGGER archive_entries_no_update BEFORE UPDATE ON archive_entries
  BEGIN SELECT RAISE(ABORT, 'archive entries are append-only'); END;
CREATE TRIGGER archive_entries_no_delete BEFORE DELETE ON archive_entries
  BEGIN SELECT RAISE(ABORT, 'archive entries are append-only'); END;
CREATE TABLE archive_head (
  id INTEGER PRIMARY KEY CHECK (id = 1),
  sequence INTEGER NOT NULL,
  hash TEXT NOT NULL
);
INSERT INTO archive_head (id, sequence, hash) VALUES (1, 0, '${'0'.repeat(64)}');
CREATE TABLE archive_jobs (
  job_id TEXT PRIMARY KEY,
  submitted_by TEXT,
  problem_hash TEXT,
  state TEXT NOT NULL,
  plan_id TEXT,
  last_sequence INTEGER NOT NULL
);
CREATE TABLE archive_plans (
  plan_id TEXT PRIMARY KEY,
  job_id TEXT NOT NULL UNIQUE,
  spacecraft_name TEXT NOT NULL,
  target_set_key TEXT NOT NULL,
  state TEXT NOT NULL,
  converged INTEGER NOT NULL,
  cross_check_passed INTEGER NOT NULL,
  caveat_codes TEXT NOT NULL,
  submitted_by TEXT NOT NULL,
  problem_hash TEXT NOT NULL,
  software_version TEXT NOT NULL,
  proposed_at TEXT NOT NULL,
  proposed_sequence INTEGER NOT NULL,
  decided_at TEXT,
  decided_by TEXT,
  superseded_by TEXT,
  last_sequence INTEGER NOT NULL
);
CREATE INDEX archive_plans_key ON archive_plans(spacecraft_name, target_set_key, state);
CREATE INDEX archive_plans_state ON archive_plans(state, proposed_at);
`,
  },
];

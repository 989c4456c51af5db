/** Row ↔ record mapping shared by both stores (same column names; PostgreSQL returns BIGINT as text). */
import { canonicalJson } from '../contract/canonical-json.ts';
import { parsePayload } from './verify.ts';
import type { ArchiveEntry, EntryKind, JobArchiveState, JobRecord, PlanRecord, PlanState } from '../contract/archive-types.ts';

type Row = Record<string, unknown>;

const text = (v: unknown): string => String(v);
const textOrNull = (v: unknown): string | null => (v === null || v === undefined ? null : String(v));

export function entryFromRow(row: Row): ArchiveEntry {
  return {
    sequence: Number(row.sequence),
    at: text(row.at),
    actor: text(row.actor),
    kind: text(row.kind) as EntryKind,
    planId: textOrNull(row.plan_id),
    jobId: textOrNull(row.job_id),
    payload: parsePayload(text(row.payload)),
    previousHash: text(row.previous_hash),
    hash: text(row.hash),
  };
}

/** Column values of an entry, in the order of ENTRY_COLUMNS. */
export function entryValues(e: ArchiveEntry): unknown[] {
  return [e.sequence, e.at, e.actor, e.kind, e.planId, e.jobId, canonicalJson(e.payload), e.previousHash, e.hash];
}
export const ENTRY_COLUMNS = ['sequence', 'at', 'actor', 'kind', 'plan_id', 'job_id', 'payload', 'previous_hash', 'hash'] as const;

export function planFromRow(row: Row): PlanRecord {
  let caveatCodes: string[] = [];
  try { caveatCodes = JSON.parse(text(row.caveat_codes)) as string[]; } catch { caveatCodes = []; }
  return {
    planId: text(row.plan_id),
    jobId: text(row.job_id),
    spacecraftName: text(row.spacecraft_name),
    targetSetKey: text(row.target_set_key),
    state: text(row.state) as PlanState,
    converged: row.converged === true || Number(row.converged) === 1,
    crossCheckPassed: row.cross_check_passed === true || Number(row.cross_check_passed) === 1,
    caveatCodes,
    submittedBy: text(row.submitted_by),
    problemHash: text(row.problem_hash),
    softwareVersion: text(row.software_version),
    proposedAt: text(row.proposed_at),
    proposedSequence: Number(row.proposed_sequence),
    decidedAt: textOrNull(row.decided_at),
    decidedBy: textOrNull(row.decided_by),
    supersededBy: textOrNull(row.superseded_by),
    lastSequence: Number(row.last_sequence),
  };
}

export const PLAN_COLUMNS = ['plan_id', 'job_id', 'spacecraft_name', 'target_set_key', 'state', 'converged', 'cross_check_passed',
  'caveat_codes', 'submitted_by', 'problem_hash', 'software_version', 'proposed_at', 'proposed_sequence', 'decided_at', 'decided_by',
  'superseded_by', 'last_sequence'] as const;

/** Column values of a plan record in PLAN_COLUMNS order; booleans as 0/1 (SQLite) or true/false (PostgreSQL). */
export function planValues(p: PlanRecord, booleans: 'integer' | 'boolean'): unknown[] {
  const b = (v: boolean): unknown => (booleans === 'integer' ? (v ? 1 : 0) : v);
  return [p.planId, p.jobId, p.spacecraftName, p.targetSetKey, p.state, b(p.converged), b(p.crossCheckPassed),
    JSON.stringify(p.caveatCodes), p.submittedBy, p.problemHash, p.softwareVersion, p.proposedAt, p.proposedSequence,
    p.decidedAt, p.decidedBy, p.supersededBy, p.lastSequence];
}

export function jobFromRow(row: Row): JobRecord {
  return {
    jobId: text(row.job_id),
    submittedBy: textOrNull(row.submitted_by),
    problemHash: textOrNull(row.problem_hash),
    state: text(row.state) as JobArchiveState,
    planId: textOrNull(row.plan_id),
    lastSequence: Number(row.last_sequence),
  };
}
export const JOB_COLUMNS = ['job_id', 'submitted_by', 'problem_hash', 'state', 'plan_id', 'last_sequence'] as const;
export function jobValues(j: JobRecord): unknown[] {
  return [j.jobId, j.submittedBy, j.problemHash, j.state, j.planId, j.lastSequence];
}

/** Clamps a list limit to [1, 1000]; default 100. */
export function clampLimit(limit: number | undefined, fallback = 100): number {
  return Math.max(1, Math.min(1000, Math.floor(limit ?? fallback)));
}

/**
 * Shapes of the plan archive: entries of the hash chain, the plan records derived from them, the inputs
 * of each kind of append, and the `PlanArchive` interface both stores (SQLite, PostgreSQL) implement.
 */
import type { ManeuverPlan } from './plan-types.ts';

/** The kinds of entry. Every transition of a job or plan is exactly one entry. */
export const ENTRY_KINDS = ['job-submitted', 'plan-proposed', 'review', 'plan-superseded', 'job-failed', 'job-cancelled', 'study-recorded'] as const;
export type EntryKind = (typeof ENTRY_KINDS)[number];

/** Plan states, in plain words. A not-converged plan stays `proposed` but is flagged and can never be approved. */
export const PLAN_STATES = ['proposed', 'approved', 'rejected', 'superseded'] as const;
export type PlanState = (typeof PLAN_STATES)[number];

/** Review decisions. */
export type ReviewDecision = 'approve' | 'reject';

/** The hash every chain starts from (the `previousHash` of entry 1): 64 zeros. */
export const GENESIS_HASH = '0'.repeat(64);

/**
 * One entry of the chain. `hash` = SHA-256 hex of the canonical JSON (see canonical-json.ts) of
 * `{ actor, at, jobId, kind, payloadHash, planId, previousHash, sequence }` where
 * `payloadHash` = SHA-256 hex of the canonical JSON of `payload` — so every field but `hash` is covered.
 */
export interface ArchiveEntry {
  /** 1, 2, 3, … without gaps. */
  sequence: number;
  /** When the entry was written, ISO 8601 UTC with milliseconds (`2030-01-02T03:04:05.678Z`). */
  at: string;
  /** Identity name of whoever (or which process) caused the transition. */
  actor: string;
  kind: EntryKind;
  /** The plan the entry is about; null for job entries written before any plan exists. */
  planId: string | null;
  /** The job the entry is about (every plan comes from one job); null only if unknown. */
  jobId: string | null;
  /** Kind-specific content (see the *Payload types). */
  payload: Record<string, unknown>;
  previousHash: string;
  hash: string;
}

/** Payload of `job-submitted`. */
export interface JobSubmittedPayload { problem: unknown; problemHash: string; reason?: string }
/** Payload of `plan-proposed`: the full plan, its canonical hash, and who submitted the job. */
export interface PlanProposedPayload { plan: ArchivablePlan; planHash: string; submittedBy: string }
/** Payload of `review`. */
export interface ReviewPayload { decision: ReviewDecision; reviewer: string; comment: string; acknowledgedCaveatCodes: string[] }
/** Payload of `plan-superseded`. */
export interface PlanSupersededPayload { supersededBy: string; reason: string }
/** Payload of `job-failed`. */
export interface JobFailedPayload { errorName: string; message: string }
/** Payload of `job-cancelled`. */
export interface JobCancelledPayload { reason: string }
/** Payload of `study-recorded`: a study (e.g. a Δv budget) with its kind, problem hash and canonical hash.
 * A study is never a plan: its entry has no planId, so no review can ever name it. */
export interface StudyRecordedPayload { studyKind: string; study: ArchivableStudy; studyHash: string; problemHash: string; submittedBy: string }

/** What the archive needs to know about a study; the whole study object is stored. */
export interface ArchivableStudy {
  kind: string;
  problemHash: string;
  softwareVersion: string;
  spacecraftName: string;
  caveats: ReadonlyArray<{ code: string; severity: string; text: string }>;
}
export interface RecordStudyInput {
  jobId: string;
  /** Who writes it (usually the worker's name). */
  actor: string;
  submittedBy: string;
  study: ArchivableStudy;
}
/** A recorded study: its entry and the study document. */
export interface StudyRecord { jobId: string; sequence: number; at: string; submittedBy: string; studyHash: string; study: ArchivableStudy }

/**
 * What the archive needs to know about a plan. The planner's ManeuverPlan is structurally assignable to it
 * (checked in plan-compat.ts); the whole plan object is stored, not just these fields.
 */
export interface ArchivablePlan {
  status: 'converged' | 'not-converged';
  problemHash: string;
  softwareVersion: string;
  spacecraftName: string;
  targetSetKey: string;
  crossCheck: { passed: boolean };
  caveats: ReadonlyArray<{ code: string; severity: string; text: string }>;
}

/**
 * A plan's current standing, derived from its entries (kept in a projection table updated in the same
 * transaction as the entries; the entries remain the truth and `verify` re-derives it).
 */
export interface PlanRecord {
  /** Set on listed plans whose projection row disagrees with the entries (the other fields then follow the entries). */
  inconsistency?: string;
  planId: string;
  jobId: string;
  spacecraftName: string;
  targetSetKey: string;
  state: PlanState;
  /** False for a plan whose status is 'not-converged' (flagged; never approvable). */
  converged: boolean;
  crossCheckPassed: boolean;
  caveatCodes: string[];
  submittedBy: string;
  problemHash: string;
  softwareVersion: string;
  /** ISO UTC time of the plan-proposed entry. */
  proposedAt: string;
  proposedSequence: number;
  decidedAt: string | null;
  decidedBy: string | null;
  supersededBy: string | null;
  /** Sequence of the latest entry about this plan. */
  lastSequence: number;
}

/** A job as the archive knows it. */
export type JobArchiveState = 'submitted' | 'proposed' | 'failed' | 'cancelled';
export interface JobRecord {
  jobId: string;
  submittedBy: string | null;
  problemHash: string | null;
  state: JobArchiveState;
  planId: string | null;
  lastSequence: number;
}

/** Result of an idempotent append: `created` false when the job already had that entry. */
export interface AppendResult { created: boolean; entries: ArchiveEntry[] }

export interface RecordJobSubmittedInput { jobId: string; actor: string; problem: unknown; problemHash?: string; reason?: string }
export interface RecordPlanProposedInput {
  jobId: string;
  /** Who writes it (usually the worker's name). */
  actor: string;
  /** Identity name of whoever submitted the job (the two-person rule compares against it). */
  submittedBy: string;
  plan: ArchivablePlan;
}
export interface RecordPlanProposedResult extends AppendResult { planId: string; superseded: string[] }
export interface RecordJobFailedInput { jobId: string; actor: string; errorName: string; message: string }
export interface RecordJobCancelledInput { jobId: string; actor: string; reason?: string }
export interface RecordReviewInput {
  planId: string;
  reviewer: string;
  decision: ReviewDecision;
  comment: string;
  acknowledgedCaveatCodes: string[];
}
/**
 * Rules checked inside the store's write transaction, against the plan as it stands under the lock.
 * Throw to refuse (the transaction rolls back and nothing is appended).
 */
export type ReviewGuard = (plan: PlanRecord, input: RecordReviewInput) => void;

/** Filter for listing plans. Dates are ISO UTC; `from` inclusive, `to` exclusive, on `proposedAt`. */
export interface PlanFilter {
  state?: PlanState;
  spacecraftName?: string;
  from?: string;
  to?: string;
  /** Only not-converged (true) or only converged (false) plans. */
  converged?: boolean;
  /** @defaultValue 100, at most 1000 */
  limit?: number;
  offset?: number;
}

/** Where verification stopped, and why. */
export type VerifyFailureReason = 'hash-mismatch' | 'previous-hash-mismatch' | 'missing-entry' | 'malformed' | 'head-mismatch';
export interface VerifyFailure {
  /** The first entry (by sequence) that does not match; for a missing entry, the sequence that is absent. */
  sequence: number;
  reason: VerifyFailureReason;
  /** For a broken link: the entry before it, which most likely was edited and re-hashed. */
  likelyEditedSequence?: number;
  message: string;
  expected?: string;
  found?: string;
}
export interface ProjectionMismatch { planId: string; field: string; derived: unknown; stored: unknown }
/** A head recorded earlier (outside the database), to compare the chain with. */
export interface ExpectedHead { sequence: number; hash: string }
/**
 * The comparison with a recorded head: `found` is the hash the chain now holds at that sequence (null when the
 * chain ends before it: entries were cut). It matches only when the entry is still there, unchanged.
 */
export interface ExpectedHeadCheck extends ExpectedHead { found: string | null; matches: boolean }
export interface VerifyOptions {
  /** Also require the chain to hold this entry unchanged (detects cut-and-reappended newest entries). */
  expectHead?: ExpectedHead;
}
export interface VerifyReport {
  ok: boolean;
  entriesChecked: number;
  /** Sequence and hash of the last entry that checked out (0 and GENESIS_HASH when none did). */
  lastGoodSequence: number;
  lastGoodHash: string;
  /** The head the store records (sequence and hash of the newest entry). */
  head: { sequence: number; hash: string };
  firstFailure: VerifyFailure | null;
  /** Plan states in the projection table that differ from what the entries say. */
  projectionMismatches: ProjectionMismatch[];
  /** Present when an expected head was given; `ok` is false unless it matches. */
  expectedHead?: ExpectedHeadCheck;
  durationMs: number;
}

/** The archive. Append-only: there is no method that updates or deletes an entry. */
export interface PlanArchive {
  readonly storeKind: 'sqlite' | 'postgres';
  /** Records a submitted job (idempotent by jobId). */
  recordJobSubmitted(input: RecordJobSubmittedInput): Promise<AppendResult>;
  /**
   * Records the plan a job produced, exactly once per job (idempotent by jobId: a repeat returns the first
   * plan's id with `created: false`). In the same transaction, older proposed plans with the same spacecraft
   * and targetSetKey are superseded — only by a plan that could be approved (converged, cross-check passed).
   * A job already recorded as failed or cancelled gets no plan (ArchiveConflictError).
   */
  recordPlanProposed(input: RecordPlanProposedInput): Promise<RecordPlanProposedResult>;
  /** Records a job's failure (idempotent: a job gets at most one terminal entry). */
  recordJobFailed(input: RecordJobFailedInput): Promise<AppendResult>;
  /** Records a job's cancellation (idempotent: a job gets at most one terminal entry). */
  recordJobCancelled(input: RecordJobCancelledInput): Promise<AppendResult>;
  /**
   * Records a review. Under the write lock: the plan must exist (ArchiveNotFoundError) and be `proposed`
   * (ArchiveConflictError otherwise — so of two concurrent reviews exactly one wins); then `guard` runs.
   */
  recordReview(input: RecordReviewInput, guard?: ReviewGuard): Promise<{ entry: ArchiveEntry; plan: PlanRecord }>;
  /**
   * Records the study a job produced, exactly once per job (idempotent by jobId). A study is never a plan:
   * its entry names no plan, so it can never be reviewed or approved. A job already recorded as failed or
   * cancelled gets no study (ArchiveConflictError).
   */
  recordStudy(input: RecordStudyInput): Promise<AppendResult>;
  /** The study a job recorded, if any. */
  getStudyByJob(jobId: string): Promise<StudyRecord | undefined>;
  getPlan(planId: string): Promise<PlanRecord | undefined>;
  getPlanByJob(jobId: string): Promise<PlanRecord | undefined>;
  /** The full plan document as archived in its plan-proposed entry. */
  /** The full plan document as its plan-proposed entry holds it: a ManeuverPlan, since the service's one writer
   * of plans (the worker's plan sink) records ManeuverPlans; the chain's hashes show it unchanged since. */
  getPlanDocument(planId: string): Promise<ManeuverPlan | undefined>;
  getJob(jobId: string): Promise<JobRecord | undefined>;
  listPlans(filter?: PlanFilter): Promise<PlanRecord[]>;
  /** Every entry about the plan and its job, in sequence order. */
  history(planId: string): Promise<ArchiveEntry[]>;
  /** Entries with sequence >= fromSequence, in order, at most `limit` (default 1000). */
  entries(fromSequence?: number, limit?: number): Promise<ArchiveEntry[]>;
  /** The newest entry's sequence and hash (0 and GENESIS_HASH for an empty archive). */
  head(): Promise<{ sequence: number; hash: string }>;
  /** Walks the whole chain; names the first entry that does not match. */
  verify(options?: VerifyOptions): Promise<VerifyReport>;
  close(): Promise<void>;
}

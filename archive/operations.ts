/**
 * The archive's write operations, written once against `ArchiveTx` (what a store offers inside its write
 * transaction). Each store runs them while holding its store-level write lock (SQLite BEGIN IMMEDIATE,
 * PostgreSQL SELECT … FOR UPDATE on the head row), so the sequence, the chain and every rule checked here
 * see one consistent state even with many processes appending.
 */
import { randomUUID } from 'node:crypto';
import { canonicalJson } from '../contract/canonical-json.ts';
import { canonicalHash } from './chain.ts';
import { sealEntry } from './chain.ts';
import { ArchiveConflictError, ArchiveInputError, ArchiveIntegrityError, ArchiveNotFoundError } from './errors.ts';
import { applyToJob, applyToPlan, planFromProposal } from './projection.ts';
import type {
  AppendResult, ArchiveEntry, EntryKind, JobRecord, PlanRecord, RecordJobCancelledInput, RecordJobFailedInput,
  RecordJobSubmittedInput, RecordPlanProposedInput, RecordPlanProposedResult, RecordReviewInput, RecordStudyInput, ReviewGuard,
  StudyRecord, StudyRecordedPayload,
} from '../contract/archive-types.ts';

/** What a store offers inside its write transaction. Reads see the locked, current state. */
export interface ArchiveTx {
  head(): Promise<{ sequence: number; hash: string }>;
  /** Inserts the entry and moves the head to it. */
  insertEntry(entry: ArchiveEntry): Promise<void>;
  getJob(jobId: string): Promise<JobRecord | undefined>;
  putJob(job: JobRecord): Promise<void>;
  getPlan(planId: string): Promise<PlanRecord | undefined>;
  getPlanByJob(jobId: string): Promise<PlanRecord | undefined>;
  putPlan(plan: PlanRecord): Promise<void>;
  proposedPlansFor(spacecraftName: string, targetSetKey: string): Promise<PlanRecord[]>;
  entriesOfJob(jobId: string, kinds: readonly EntryKind[]): Promise<ArchiveEntry[]>;
  /** Every entry whose planId is `planId`, in sequence order. */
  entriesOfPlan(planId: string): Promise<ArchiveEntry[]>;
}

/** Appends one entry at the head (sequence, previous hash, time and hash filled in). */
async function append(tx: ArchiveTx, now: () => Date, draft: Pick<ArchiveEntry, 'actor' | 'kind' | 'planId' | 'jobId' | 'payload'>): Promise<ArchiveEntry> {
  const head = await tx.head();
  const entry = sealEntry({ sequence: head.sequence + 1, at: now().toISOString(), previousHash: head.hash, ...draft });
  await tx.insertEntry(entry);
  return entry;
}

function requireText(field: string, value: unknown): string {
  if (typeof value !== 'string' || value.trim() === '') throw new ArchiveInputError(field, 'must be a non-empty string');
  return value;
}

export async function recordJobSubmitted(tx: ArchiveTx, now: () => Date, input: RecordJobSubmittedInput): Promise<AppendResult> {
  requireText('jobId', input.jobId);
  requireText('actor', input.actor);
  const existing = await tx.getJob(input.jobId);
  if (existing?.submittedBy) return { created: false, entries: await tx.entriesOfJob(input.jobId, ['job-submitted']) };
  const problemHash = input.problemHash ?? canonicalHash(input.problem);
  const payload: Record<string, unknown> = { problem: input.problem, problemHash };
  if (input.reason !== undefined) payload.reason = input.reason;
  const entry = await append(tx, now, { actor: input.actor, kind: 'job-submitted', planId: null, jobId: input.jobId, payload });
  await tx.putJob(applyToJob(existing, entry));
  return { created: true, entries: [entry] };
}

function checkPlanShape(plan: RecordPlanProposedInput['plan']): void {
  if (plan === null || typeof plan !== 'object') throw new ArchiveInputError('plan', 'must be an object');
  if (plan.status !== 'converged' && plan.status !== 'not-converged') throw new ArchiveInputError('plan.status', "must be 'converged' or 'not-converged'");
  requireText('plan.spacecraftName', plan.spacecraftName);
  requireText('plan.targetSetKey', plan.targetSetKey);
  if (typeof plan.crossCheck?.passed !== 'boolean') throw new ArchiveInputError('plan.crossCheck.passed', 'must be a boolean');
  if (!Array.isArray(plan.caveats) || plan.caveats.length === 0) throw new ArchiveInputError('plan.caveats', 'must be a non-empty list');
  plan.caveats.forEach((c, i) => requireText(`plan.caveats[${i}].code`, c?.code));
}

export async function recordPlanProposed(tx: ArchiveTx, now: () => Date, input: RecordPlanProposedInput): Promise<RecordPlanProposedResult> {
  requireText('jobId', input.jobId);
  requireText('actor', input.actor);
  requireText('submittedBy', input.submittedBy);
  checkPlanShape(input.plan);
  const already = await tx.getPlanByJob(input.jobId);
  if (already) {
    return { created: false, planId: already.planId, superseded: [], entries: await tx.entriesOfJob(input.jobId, ['plan-proposed']) };
  }
  // A job that ended without a plan stays ended: a late worker result must not turn it into a proposal.
  const [ended] = await tx.entriesOfJob(input.jobId, ['job-failed', 'job-cancelled']);
  if (ended) {
    const state = ended.kind === 'job-failed' ? 'failed' : 'cancelled';
    throw new ArchiveConflictError(`job ${input.jobId} was ${state} (entry ${ended.sequence}); no plan is recorded for it`, state);
  }
  const planId = `plan-${randomUUID()}`;
  const payload = { plan: input.plan, planHash: canonicalHash(input.plan), submittedBy: input.submittedBy };
  const proposed = await append(tx, now, { actor: input.actor, kind: 'plan-proposed', planId, jobId: input.jobId,
    payload: payload as unknown as Record<string, unknown> });
  const record = planFromProposal(proposed);
  const entries = [proposed];
  const superseded: string[] = [];
  // Only a plan that could be approved replaces an older one: an unusable plan must not hide a usable one.
  if (record.converged && record.crossCheckPassed) {
    for (const older of await tx.proposedPlansFor(record.spacecraftName, record.targetSetKey)) {
      if (older.planId === planId) continue;
      const entry = await append(tx, now, { actor: input.actor, kind: 'plan-superseded', planId: older.planId, jobId: older.jobId,
        payload: { supersededBy: planId, reason: `a newer plan for ${record.spacecraftName} / ${record.targetSetKey} was proposed` } });
      await tx.putPlan(applyToPlan(older, entry));
      entries.push(entry);
      superseded.push(older.planId);
    }
  }
  await tx.putPlan(record);
  await tx.putJob(applyToJob(await tx.getJob(input.jobId), proposed));
  return { created: true, planId, superseded, entries };
}

async function recordJobEnd(tx: ArchiveTx, now: () => Date, kind: 'job-failed' | 'job-cancelled', jobId: string, actor: string,
  payload: Record<string, unknown>): Promise<AppendResult> {
  requireText('jobId', jobId);
  requireText('actor', actor);
  const job = await tx.getJob(jobId);
  if (job && job.state !== 'submitted') {
    return { created: false, entries: await tx.entriesOfJob(jobId, ['plan-proposed', 'job-failed', 'job-cancelled']) };
  }
  const entry = await append(tx, now, { actor, kind, planId: null, jobId, payload });
  await tx.putJob(applyToJob(job, entry));
  return { created: true, entries: [entry] };
}

export function recordJobFailed(tx: ArchiveTx, now: () => Date, input: RecordJobFailedInput): Promise<AppendResult> {
  return recordJobEnd(tx, now, 'job-failed', input.jobId, input.actor, { errorName: input.errorName, message: input.message });
}

export function recordJobCancelled(tx: ArchiveTx, now: () => Date, input: RecordJobCancelledInput): Promise<AppendResult> {
  return recordJobEnd(tx, now, 'job-cancelled', input.jobId, input.actor, { reason: input.reason ?? 'cancelled' });
}

/**
 * Records a job's study once (idempotent by jobId). A study entry names no plan: it can never be reviewed.
 * A job that already ended (failed, cancelled) or produced a plan gets no study.
 */
export async function recordStudy(tx: ArchiveTx, now: () => Date, input: RecordStudyInput): Promise<AppendResult> {
  requireText('jobId', input.jobId);
  requireText('actor', input.actor);
  requireText('submittedBy', input.submittedBy);
  const study = input.study;
  if (study === null || typeof study !== 'object') throw new ArchiveInputError('study', 'must be an object');
  requireText('study.kind', study.kind);
  requireText('study.problemHash', study.problemHash);
  requireText('study.spacecraftName', study.spacecraftName);
  if (!Array.isArray(study.caveats) || study.caveats.length === 0) throw new ArchiveInputError('study.caveats', 'must be a non-empty list');
  const already = await tx.entriesOfJob(input.jobId, ['study-recorded']);
  if (already.length > 0) return { created: false, entries: already };
  const [ended] = await tx.entriesOfJob(input.jobId, ['job-failed', 'job-cancelled', 'plan-proposed']);
  if (ended) {
    const state = ended.kind === 'job-failed' ? 'failed' : ended.kind === 'job-cancelled' ? 'cancelled' : 'proposed';
    throw new ArchiveConflictError(`job ${input.jobId} already ended (${ended.kind}, entry ${ended.sequence}); no study is recorded for it`, state);
  }
  const payload: StudyRecordedPayload = {
    studyKind: study.kind, study, studyHash: canonicalHash(study), problemHash: study.problemHash, submittedBy: input.submittedBy,
  };
  const entry = await append(tx, now, { actor: input.actor, kind: 'study-recorded', planId: null, jobId: input.jobId,
    payload: payload as unknown as Record<string, unknown> });
  return { created: true, entries: [entry] };
}

/** The study a job recorded, from its `study-recorded` entry. */
export async function studyOfJob(tx: ArchiveTx, jobId: string): Promise<StudyRecord | undefined> {
  const [entry] = await tx.entriesOfJob(jobId, ['study-recorded']);
  if (!entry) return undefined;
  const p = entry.payload as unknown as StudyRecordedPayload;
  return { jobId, sequence: entry.sequence, at: entry.at, submittedBy: p.submittedBy, studyHash: p.studyHash, study: p.study };
}

/** Plan-record fields the review rules or the decision depend on. */
const RULE_FIELDS = ['planId', 'jobId', 'state', 'converged', 'crossCheckPassed', 'caveatCodes', 'submittedBy', 'decidedBy'] as const;
/** Plan-record fields a reader is shown: the rule fields and what names and links the plan. */
const READ_FIELDS = [...RULE_FIELDS, 'spacecraftName', 'targetSetKey', 'supersededBy'] as const;

/** The first of `fields` where the stored projection row differs from the record derived from the entries. */
function differingField(stored: PlanRecord | undefined, derived: PlanRecord, fields: readonly (keyof PlanRecord)[]): keyof PlanRecord | undefined {
  if (!stored) return 'planId';
  return fields.find((f) => canonicalJson(stored[f]) !== canonicalJson(derived[f]));
}

/**
 * A plan as readers see it: the projection row checked against the plan's own entries (and its job's
 * job-submitted entry). Undefined when the plan is unknown; ArchiveIntegrityError (ARCHIVE_INCONSISTENT)
 * naming the field when the row was edited — a read never shows a state the entries do not record.
 */
export async function checkedPlan(tx: ArchiveTx, planId: string): Promise<PlanRecord | undefined> {
  const stored = await tx.getPlan(planId);
  const planEntries = await tx.entriesOfPlan(planId);
  if (!stored && planEntries.length === 0) return undefined;
  const derived = await planFromEntries(tx, planId, planEntries);
  const differs = differingField(stored, derived, READ_FIELDS);
  if (differs) {
    throw new ArchiveIntegrityError(`plan ${planId}: the plan table's ${differs} (${canonicalJson(stored?.[differs] ?? null)}) `
      + `disagrees with the archive entries (${canonicalJson(derived[differs])}); an auditor must run veer verify and repair the store`);
  }
  return stored;
}

/**
 * Listed plans, each checked as checkedPlan does. A row that disagrees with its entries is shown as the
 * entries say (when they say anything) and flagged with `inconsistency`, so a filter on the edited column
 * cannot pass it off as, say, approved.
 */
export async function checkedListing(tx: ArchiveTx, rows: readonly PlanRecord[]): Promise<PlanRecord[]> {
  const out: PlanRecord[] = [];
  for (const row of rows) {
    try {
      out.push((await checkedPlan(tx, row.planId)) ?? row);
    } catch (error) {
      if (!(error instanceof ArchiveIntegrityError)) throw error;
      const entries = await tx.entriesOfPlan(row.planId);
      const derived = entries.some((e) => e.kind === 'plan-proposed') ? await planFromEntries(tx, row.planId, entries).catch(() => row) : row;
      out.push({ ...derived, inconsistency: error.message });
    }
  }
  return out;
}

/** The plan record re-derived from its plan-proposed entry, later entries, and its job's job-submitted entry. */
async function planFromEntries(tx: ArchiveTx, planId: string, planEntries: readonly ArchiveEntry[]): Promise<PlanRecord> {
  const proposal = planEntries.find((e) => e.kind === 'plan-proposed');
  if (!proposal) throw new ArchiveIntegrityError(`plan ${planId} is in the plan table but has no plan-proposed entry`);
  let plan = planFromProposal(proposal);
  for (const entry of planEntries) if (entry.sequence > proposal.sequence) plan = applyToPlan(plan, entry);
  const submitted = proposal.jobId ? (await tx.entriesOfJob(proposal.jobId, ['job-submitted']))[0] : undefined;
  if (submitted && submitted.actor !== plan.submittedBy) {
    throw new ArchiveIntegrityError(`plan ${planId}: its job was submitted by ${submitted.actor} but its plan-proposed entry names ${plan.submittedBy}`);
  }
  return plan;
}

export async function recordReview(tx: ArchiveTx, now: () => Date, input: RecordReviewInput, guard?: ReviewGuard): Promise<{ entry: ArchiveEntry; plan: PlanRecord }> {
  requireText('reviewer', input.reviewer);
  if (input.decision !== 'approve' && input.decision !== 'reject') throw new ArchiveInputError('decision', "must be 'approve' or 'reject'");
  const stored = await tx.getPlan(input.planId);
  const planEntries = await tx.entriesOfPlan(input.planId);
  if (!stored && planEntries.length === 0) throw new ArchiveNotFoundError(`plan ${input.planId} is not in the archive`);
  // The rules read the plan as its entries say it is (under the lock), never the editable plan table alone.
  const plan = await planFromEntries(tx, input.planId, planEntries);
  const differs = differingField(stored, plan, RULE_FIELDS);
  if (differs) {
    throw new ArchiveIntegrityError(`plan ${input.planId}: the plan table's ${differs} disagrees with the archive entries; `
      + 'no review is recorded until an auditor has run veer verify and the store is repaired');
  }
  if (plan.state !== 'proposed') {
    throw new ArchiveConflictError(`plan ${input.planId} is already ${plan.state}${plan.decidedBy ? ` by ${plan.decidedBy}` : ''}; a decision is final`, plan.state);
  }
  guard?.(plan, input);
  const entry = await append(tx, now, { actor: input.reviewer, kind: 'review', planId: plan.planId, jobId: plan.jobId,
    payload: { decision: input.decision, reviewer: input.reviewer, comment: input.comment,
      acknowledgedCaveatCodes: [...input.acknowledgedCaveatCodes] } });
  const updated = applyToPlan(plan, entry);
  await tx.putPlan(updated);
  return { entry, plan: updated };
}

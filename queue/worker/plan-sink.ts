/**
 * The seam where plans go. The worker hands every finished job's plan to a PlanSink exactly once per job
 * (a repeat after a crash must not write twice: implementations are idempotent by job id), and reports
 * failures and cancellations the same way.
 *
 * - `JobResultSink`: no archive; the plan lives in the job's result in Redis (planId = job id).
 * - `ArchivePlanSink`: appends to the hash-chained archive (archive/), whose appends are idempotent by job id.
 */
import type { BudgetResult, ManeuverPlan } from '../../planner/index.ts';
import type { FailureData } from '../../contract/errors.ts';
import type { PlanArchive } from '../../contract/archive-types.ts';
import type { RetargetJobData } from '../../contract/job-types.ts';
import type { BudgetJobData } from '../../contract/budget-job-types.ts';

export interface ProposedPlanInput {
  jobId: string;
  /** Who writes (the worker's name). */
  actor: string;
  /** Identity name of the job's submitter. */
  submittedBy: string;
  plan: ManeuverPlan;
}

/** A finished study (a Δv budget) to keep: never a plan, never approvable. */
export interface StudyInput {
  jobId: string;
  actor: string;
  submittedBy: string;
  study: BudgetResult;
}

export interface PlanSink {
  /** `archive` or `job-result`; reported in job results. */
  readonly kind: string;
  /** True when the plan must also be kept in the job's result (no other store holds it). */
  readonly keepsPlanInJobResult: boolean;
  /** Records a job's submission from its queued data (idempotent by jobId): the one writer of `job-submitted`. */
  recordSubmitted(jobId: string, data: RetargetJobData | BudgetJobData): Promise<void>;
  /** Stores the proposed plan exactly once per job; a repeat returns the first plan's id with created false. */
  storeProposedPlan(input: ProposedPlanInput): Promise<{ planId: string; created: boolean }>;
  /** Stores a job's study exactly once per job; its id is the job id. */
  storeStudy(input: StudyInput): Promise<{ studyId: string; created: boolean }>;
  /** Records a final failure, given as data (idempotent). */
  recordFailed(input: { jobId: string; actor: string; failure: FailureData }): Promise<void>;
  /** Records a cancellation (idempotent). */
  recordCancelled(input: { jobId: string; actor: string; reason: string }): Promise<void>;
  close(): Promise<void>;
}

/** Plans stay in the job's result; the plan id is the job id. Nothing else is recorded. */
export class JobResultSink implements PlanSink {
  readonly kind = 'job-result';
  readonly keepsPlanInJobResult = true;
  async recordSubmitted(): Promise<void> {}
  async storeProposedPlan(input: ProposedPlanInput): Promise<{ planId: string; created: boolean }> {
    return { planId: input.jobId, created: true };
  }
  async storeStudy(input: StudyInput): Promise<{ studyId: string; created: boolean }> {
    return { studyId: input.jobId, created: true };
  }
  async recordFailed(): Promise<void> {}
  async recordCancelled(): Promise<void> {}
  async close(): Promise<void> {}
}

/** The part of the archive (contract PlanArchive) the sink uses; every method idempotent by job id. */
export type ArchiveAppends = Pick<PlanArchive, 'recordJobSubmitted' | 'recordPlanProposed' | 'recordJobFailed' | 'recordStudy' | 'recordJobCancelled' | 'close'>;

/** Appends to the plan archive; exactly-once per job comes from the archive's idempotent appends. */
export class ArchivePlanSink implements PlanSink {
  readonly kind = 'archive';
  readonly keepsPlanInJobResult = false;
  constructor(private readonly archive: ArchiveAppends, private readonly ownsArchive = true) {}
  async recordSubmitted(jobId: string, data: RetargetJobData | BudgetJobData): Promise<void> {
    // A budget job's submission is its whole request (problem and budget settings); a retarget job's its problem.
    await this.archive.recordJobSubmitted({
      jobId, actor: data.submittedBy, problem: 'budget' in data ? data.budget : data.problem, problemHash: data.problemHash, reason: data.reason,
    });
  }
  async storeProposedPlan(input: ProposedPlanInput): Promise<{ planId: string; created: boolean }> {
    const result = await this.archive.recordPlanProposed(input);
    return { planId: result.planId, created: result.created };
  }
  async storeStudy(input: StudyInput): Promise<{ studyId: string; created: boolean }> {
    const result = await this.archive.recordStudy(input);
    return { studyId: input.jobId, created: result.created };
  }
  async recordFailed(input: { jobId: string; actor: string; failure: FailureData }): Promise<void> {
    const { failure: f } = input;
    await this.archive.recordJobFailed({ jobId: input.jobId, actor: input.actor, errorName: f.name, message: f.field ? `${f.field}: ${f.message}` : f.message });
  }
  async recordCancelled(input: { jobId: string; actor: string; reason: string }): Promise<void> {
    await this.archive.recordJobCancelled(input);
  }
  async close(): Promise<void> {
    if (this.ownsArchive) await this.archive.close();
  }
}

/**
 * Records a job removed from the queue before any worker ran it (so no worker recorded its submission): its
 * submission, through the sink's one writer, then its cancellation by `by`.
 */
export async function recordRemovedJob(archive: ArchiveAppends, jobId: string, data: RetargetJobData | BudgetJobData, by: string, reason: string): Promise<void> {
  const sink = new ArchivePlanSink(archive, false);
  await sink.recordSubmitted(jobId, data);
  await sink.recordCancelled({ jobId, actor: by, reason });
}

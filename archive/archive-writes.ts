/**
 * The appends, written once for both stores: each runs its operation (operations.ts) inside the store's own
 * write transaction, which serialises writers (SQLite: BEGIN IMMEDIATE; PostgreSQL: the archive_head row lock).
 */
import * as ops from './operations.ts';
import type { ArchiveTx } from './operations.ts';
import type {
  AppendResult, ArchiveEntry, PlanRecord, RecordJobCancelledInput, RecordJobFailedInput, RecordJobSubmittedInput,
  RecordPlanProposedInput, RecordPlanProposedResult, RecordReviewInput, RecordStudyInput, ReviewGuard, StudyRecord,
} from '../contract/archive-types.ts';

export abstract class ArchiveWrites {
  /** Clock for entry times. */
  protected abstract readonly now: () => Date;
  /** Runs `fn` in one write transaction of the store; commits on success, rolls back on error. */
  protected abstract write<T>(fn: (tx: ArchiveTx) => Promise<T>): Promise<T>;

  recordJobSubmitted(input: RecordJobSubmittedInput): Promise<AppendResult> {
    return this.write((tx) => ops.recordJobSubmitted(tx, this.now, input));
  }
  recordPlanProposed(input: RecordPlanProposedInput): Promise<RecordPlanProposedResult> {
    return this.write((tx) => ops.recordPlanProposed(tx, this.now, input));
  }
  recordJobFailed(input: RecordJobFailedInput): Promise<AppendResult> {
    return this.write((tx) => ops.recordJobFailed(tx, this.now, input));
  }
  recordJobCancelled(input: RecordJobCancelledInput): Promise<AppendResult> {
    return this.write((tx) => ops.recordJobCancelled(tx, this.now, input));
  }
  recordReview(input: RecordReviewInput, guard?: ReviewGuard): Promise<{ entry: ArchiveEntry; plan: PlanRecord }> {
    return this.write((tx) => ops.recordReview(tx, this.now, input, guard));
  }
  recordStudy(input: RecordStudyInput): Promise<AppendResult> {
    return this.write((tx) => ops.recordStudy(tx, this.now, input));
  }
  /** Read under the write transaction (both stores offer entriesOfJob there); studies are read rarely. */
  getStudyByJob(jobId: string): Promise<StudyRecord | undefined> {
    return this.write((tx) => ops.studyOfJob(tx, jobId));
  }
}

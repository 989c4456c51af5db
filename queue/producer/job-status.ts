/**
 * What the API shows of a job: its client-facing state, status (progress, result without the plan or
 * study, failure as data) and the progress of a fanned-out sample run, read from the BullMQ job and its
 * cancel record. Pure reads; RetargetQueue fetches the job and calls these.
 */
import type { FailureData } from '../../contract/errors.ts';
import type { BudgetJobResult, BudgetJobStatus } from '../../contract/budget-job-types.ts';
import { JOB_NAMES, type JobProgress, type JobState, type JobStatus } from '../../contract/job-types.ts';
import type { CancelRecord } from '../cancellation.ts';
import type { BudgetJob, TopLevelJob } from './queued-job.ts';

const CLIENT_STATE: Record<string, JobState> = {
  waiting: 'waiting', prioritized: 'waiting', 'waiting-children': 'waiting-children', delayed: 'delayed',
  active: 'active', completed: 'completed', failed: 'failed',
};

/** The state the API shows: BullMQ's, with 'prioritized' as waiting and a cancelled failure as cancelled. */
export function clientState(state: string, job: TopLevelJob, cancel: CancelRecord | null): JobState {
  if (state === 'failed' && (cancel || job.data.failure?.name === 'CancelledError')) return 'cancelled';
  return CLIENT_STATE[state] ?? 'unknown';
}

/** A retarget job's status as the API shows it (result without the plan). */
export function describeJob(job: TopLevelJob, state: string, cancel: CancelRecord | null): JobStatus {
  const shown = clientState(state, job, cancel);
  const progress = typeof job.progress === 'object' && job.progress !== null ? job.progress : null;
  // A budget job's result is shown by describeBudgetJob, which replaces this one.
  const result = job.name === JOB_NAMES.retarget && job.returnvalue ? { ...job.returnvalue } : null;
  if (result) delete result.plan;
  return {
    id: String(job.id), kind: 'retarget', state: shown, priority: job.data.priority, submittedBy: job.data.submittedBy,
    submittedAt: job.data.submittedAt, reason: job.data.reason, spacecraftName: job.data.problem.spacecraft.name,
    problemHash: job.data.problemHash, attemptsMade: job.attemptsMade, progress,
    startedAt: job.processedOn ? new Date(job.processedOn).toISOString() : null,
    finishedAt: job.finishedOn ? new Date(job.finishedOn).toISOString() : null,
    result: shown === 'completed' ? result : null,
    error: shown === 'failed' || shown === 'cancelled' ? failureOfJob(job, cancel) : null,
    cancelRequested: cancel !== null,
  };
}

/** A budget job's status as the API shows it (result without the study). */
export function describeBudgetJob(job: BudgetJob, state: string, cancel: CancelRecord | null): BudgetJobStatus {
  const status = describeJob(job, state, cancel);
  const result = status.state === 'completed' && job.returnvalue ? { ...job.returnvalue } : null;
  if (result) delete result.result;
  return { ...status, kind: 'delta-v-budget', result };
}

/** The status of a job of `kind` removed by a cancel before any worker ran it (only its cancel record is
 * left); undefined when the record says no such thing or names the other kind. */
export function cancelledBeforeRunStatus(jobId: string, cancel: CancelRecord | null, kind: 'retarget' | 'delta-v-budget'): JobStatus | undefined {
  const w = cancel?.removedWhileWaiting;
  if (!cancel || !w || (w.kind ?? 'retarget') !== kind) return undefined;
  return {
    id: jobId, kind: 'retarget', state: 'cancelled', priority: w.priority === 'urgent' ? 'urgent' : 'routine', submittedBy: w.submittedBy,
    submittedAt: w.submittedAt, reason: w.reason, spacecraftName: w.spacecraftName, attemptsMade: 0, progress: null,
    startedAt: null, finishedAt: cancel.at, result: null, cancelRequested: true,
    error: { name: 'CancelledError', code: 'CANCELLED', message: `cancelled by ${cancel.by} before it ran: ${cancel.reason}` },
  };
}

/**
 * Progress of a fanned-out Monte Carlo run, from its child jobs (ids end in `-mc-<firstIndex>`): samples in
 * finished batches over all samples. Exact, since batch sizes follow from the first indices.
 */
export async function fanOutProgress(job: TopLevelJob, total = job.data.problem.dispersion.samples, label = 'Monte Carlo',
  stage: JobProgress['stage'] = 'dispersion'): Promise<JobProgress | null> {
  const deps = await job.getDependencies({ processed: { count: 10_000 }, unprocessed: { count: 10_000 } });
  const firstIndex = (key: string): number => Number(/-mc-(\d+)$/.exec(key)?.[1] ?? NaN);
  const done = Object.keys(deps.processed ?? {}).map(firstIndex);
  const all = [...done, ...(deps.unprocessed ?? []).map(firstIndex)].filter(Number.isFinite).sort((a, b) => a - b);
  if (all.length === 0) return null;
  const sizeOf = (first: number): number => {
    const next = all.find((f) => f > first);
    return (next ?? total) - first;
  };
  const samplesDone = done.filter(Number.isFinite).reduce((sum, f) => sum + sizeOf(f), 0);
  return {
    stage, fraction: 0.5 + 0.45 * (samplesDone / total),
    message: `${label}: ${done.length} of ${all.length} batches done`, samplesDone, samplesTotal: total,
    at: new Date().toISOString(),
  };
}

/**
 * The failure of a job that ended for good, as the worker recorded it in the job's data. A job cancelled
 * while its run was ending reads as cancelled; one the queue library failed on its own (a stalled job over
 * its limit) has only the library's text, given as the message.
 */
function failureOfJob(job: TopLevelJob, cancel: CancelRecord | null): FailureData {
  const recorded = job.data.failure;
  if (cancel && recorded?.name !== 'CancelledError') {
    return { name: 'CancelledError', code: 'CANCELLED', message: `cancelled by ${cancel.by}: ${cancel.reason}` };
  }
  return recorded ?? { name: 'Error', code: 'FAILED', message: job.failedReason || 'unknown failure' };
}

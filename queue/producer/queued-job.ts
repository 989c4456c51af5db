/**
 * The BullMQ job types of the one queue both job kinds share, told apart by job name: the contract's job data
 * and result shapes bound into BullMQ's Job generics, so reading a job back needs no cast — only a check of
 * its name, which narrows the union.
 */
import type { Job } from 'bullmq';
import { BUDGET_JOB_NAMES, type BudgetBatchData, type BudgetBatchResult, type BudgetJobData, type BudgetJobResult } from '../../contract/budget-job-types.ts';
import {
  JOB_NAMES, type JobProgress, type RetargetJobData, type RetargetJobResult, type SampleBatchData, type SampleBatchResult,
} from '../../contract/job-types.ts';

/** A job's progress: the workers report JobProgress objects; before the first report BullMQ holds its
 * default, 0. */
export type QueuedProgress = JobProgress | number;

export type RetargetJob = Job<RetargetJobData, RetargetJobResult, typeof JOB_NAMES.retarget, QueuedProgress>;
export type BudgetJob = Job<BudgetJobData, BudgetJobResult, typeof BUDGET_JOB_NAMES.budget, QueuedProgress>;
export type SampleBatchJob = Job<SampleBatchData, SampleBatchResult, typeof JOB_NAMES.samples, QueuedProgress>;
export type BudgetBatchJob = Job<BudgetBatchData, BudgetBatchResult, typeof BUDGET_JOB_NAMES.samples, QueuedProgress>;

/** Any job of the retarget queue. */
export type QueuedJob = RetargetJob | BudgetJob | SampleBatchJob | BudgetBatchJob;
/** A job a client submitted (not a sample batch a worker fanned out). */
export type TopLevelJob = RetargetJob | BudgetJob;

/** True for a retarget or budget job (not a sample batch). */
export function isTopLevelJob(job: QueuedJob): job is TopLevelJob {
  return job.name === JOB_NAMES.retarget || job.name === BUDGET_JOB_NAMES.budget;
}

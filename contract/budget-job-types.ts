/**
 * What a Δv budget job carries: the budget request (the one budget schema) plus who submitted it, why, how
 * urgent it is, and an optional idempotency key; its fanned-out batches of non-linear samples; its result
 * and status. A budget job runs in the retarget queue beside retargeting jobs (same workers, priorities,
 * cancellation); it yields a study, never a plan.
 */
import * as z from 'zod';
import { budgetRequestSchema } from './budget-schema.ts';
import type { BudgetRequest } from './budget-schema.ts';
import type { BudgetNominal, BudgetResult, BudgetSample } from './budget-types.ts';
import { freeTextSchema } from './free-text.ts';
import { PRIORITIES, idempotencyKeySchema, type JobStatus, type RetargetJobData, type Priority } from './job-types.ts';

/** Job names of budget jobs inside the retarget queue. */
export const BUDGET_JOB_NAMES = { budget: 'budget', samples: 'budget-samples' } as const;

/** The body of a budget submission (the submitter comes from the caller's identity). */
export const budgetJobRequestSchema = z.object({
  request: budgetRequestSchema,
  /** Why this budget is needed (kept with the study). */
  reason: freeTextSchema({ trim: true, min: 3, max: 2000, multiline: true, visible: true }),
  priority: z.enum(PRIORITIES).default('routine'),
  idempotencyKey: idempotencyKeySchema.optional(),
}).strict();
export type BudgetJobRequest = z.infer<typeof budgetJobRequestSchema>;

/** Data of a `budget` job in Redis. `problem` repeats `budget.problem` so the queue's job views read both kinds. */
export interface BudgetJobData extends Omit<RetargetJobData, 'step' | 'nominalPlan' | 'batches'> {
  budget: BudgetRequest;
  /** Where a re-run resumes: `prepare` (from scratch) or `await-samples` (nominal done, batches added). */
  step: 'prepare' | 'await-samples';
  /** The nominal model, kept while the non-linear batches run. */
  nominal?: BudgetNominal;
  batches?: number;
}

/** Data of a `budget-samples` child job: non-linear samples [firstIndex, firstIndex + count). */
export interface BudgetBatchData {
  parentId: string;
  budget: BudgetRequest;
  nominal: BudgetNominal;
  firstIndex: number;
  count: number;
  priority: Priority;
  /** ISO UTC end of the parent's overall time limit. */
  deadlineAt?: string;
}

export interface BudgetBatchResult { firstIndex: number; samples: BudgetSample[] }

/** Result of a finished budget job. */
export interface BudgetJobResult {
  kind: 'delta-v-budget';
  /** Where the study can be fetched (the job id: one study per job). */
  studyId: string;
  problemHash: string;
  /** `archive` or `job-result` (then `result` holds the study). */
  storedIn: string;
  /** Linear vs non-linear agreement, null when only one path ran or there was no budget. */
  agreementPassed: boolean | null;
  result?: BudgetResult;
}

/** A budget job's status for clients: the job view of the queue, with the budget's own result. */
export interface BudgetJobStatus extends Omit<JobStatus, 'result' | 'kind'> {
  kind: 'delta-v-budget';
  result: Omit<BudgetJobResult, 'result'> | null;
}

/** The status of either kind of top-level job (what `/v1/jobs` lists), told apart by `kind`. */
export type AnyJobStatus = JobStatus | BudgetJobStatus;

/**
 * What a retargeting job carries: the planner's problem (the one zod schema) plus who submitted it, why,
 * how urgent it is, and an optional idempotency key. Also the shapes of progress, results and status.
 */
import * as z from 'zod';
import type { FailureData } from './errors.ts';
import { freeTextSchema } from './free-text.ts';
import { problemSchema } from './problem-schema.ts';
import type { PlanningProblem } from './problem-schema.ts';
import type { DispersionSample, ManeuverPlan, PlanLeapSeconds, PlanProgress } from './plan-types.ts';
import type { BudgetProgress } from './budget-types.ts';

/** Queue name (Redis keys are `<QUEUE_PREFIX>:retarget:*`). */
export const RETARGET_QUEUE = 'retarget';
/** Job names inside the queue. */
export const JOB_NAMES = { retarget: 'retarget', samples: 'dispersion-samples' } as const;

export const PRIORITIES = ['urgent', 'routine'] as const;
export type Priority = (typeof PRIORITIES)[number];
/**
 * BullMQ priorities (1 is served first). Every job gets one, because BullMQ serves jobs without a priority
 * before all prioritised ones. Sample batches sit just behind their parent's class so a started run finishes.
 */
export const BULL_PRIORITY = { urgent: 1, urgentSamples: 2, routineSamples: 5, routine: 10 } as const;

/** An idempotency key: the same key from the same submitter names the same job. */
export const idempotencyKeySchema = z.string().min(8).max(128).regex(/^[A-Za-z0-9._~-]+$/, {
  error: 'must be 8–128 characters of A-Z a-z 0-9 . _ ~ -',
});

/** The body of a submission (the submitter comes from the caller's identity, never from the body). */
export const jobRequestSchema = z.object({
  problem: problemSchema,
  /** Why this retargeting is needed (kept with the plan for reviewers). */
  reason: freeTextSchema({ trim: true, min: 3, max: 2000, multiline: true, visible: true }),
  priority: z.enum(PRIORITIES).default('routine'),
  idempotencyKey: idempotencyKeySchema.optional(),
}).strict();
export type JobRequest = z.infer<typeof jobRequestSchema>;
export type JobRequestInput = z.input<typeof jobRequestSchema>;

/** Data of a `retarget` job as stored in Redis. */
export interface RetargetJobData {
  problem: PlanningProblem;
  reason: string;
  priority: Priority;
  submittedBy: string;
  submittedAt: string;
  idempotencyKey?: string;
  /** SHA-256 hex of the canonical problem with its leap-second table (planner's problemHash). */
  problemHash: string;
  /** The leap-second table the API validated the problem with (absent in jobs queued before it was
   * recorded: the worker's own table is used then). */
  leapSeconds?: PlanLeapSeconds;
  /** SHA-256 of the canonical request (problem, reason, priority): tells a true repeat from a key reuse. Only
   * with an idempotency key: without one no later submission can name this job, so nothing would compare it. */
  requestHash?: string;
  /** Random per submission: tells the submission that created the job from later repeats. */
  submissionId: string;
  /** Where a re-run resumes: `plan` (from scratch) or `await-samples` (nominal plan done, children added). */
  step: 'plan' | 'await-samples';
  /** The nominal plan, kept while fanned-out Monte Carlo batches run. */
  nominalPlan?: ManeuverPlan;
  /** Number of sample batches added as child jobs. */
  batches?: number;
  /** ISO UTC time the job first started; its time limit counts from here (set by the first run). */
  firstStartedAt?: string;
  /** How the job ended when it failed or was cancelled for good, as data (set by the worker). */
  failure?: FailureData;
}

/** Data of a `dispersion-samples` child job. */
export interface SampleBatchData {
  parentId: string;
  problem: PlanningProblem;
  plan: ManeuverPlan;
  seed: number;
  firstIndex: number;
  count: number;
  priority: Priority;
  /** ISO UTC end of the parent's overall time limit; the batch stops there (TimeLimitError). */
  deadlineAt?: string;
}

/** Result of a sample batch (what the parent collects). */
export interface SampleBatchResult { firstIndex: number; samples: DispersionSample[] }

/** Kinds of top-level jobs, as `/v1/jobs` lists them (sample batches are part of their parent). */
export const JOB_KINDS = ['retarget', 'delta-v-budget'] as const;
export type JobKind = (typeof JOB_KINDS)[number];

/** Progress stored on a job and streamed to clients: a retarget job reports the plan's stages, a budget job
 * its own (BudgetProgress). */
export interface JobProgress extends Omit<PlanProgress, 'stage'> {
  stage: PlanProgress['stage'] | BudgetProgress['stage'];
  /** ISO UTC time of this report. */
  at: string;
}

/** Result of a finished `retarget` job. */
export interface RetargetJobResult {
  /** Where the plan can be fetched. */
  planId: string;
  planStatus: ManeuverPlan['status'];
  problemHash: string;
  /** Where the plan was stored: `archive` or `job-result` (then `plan` holds it). */
  storedIn: string;
  plan?: ManeuverPlan;
}

/** Job states as clients see them: the queue library's own, plus cancelled. */
export const JOB_STATES = ['waiting', 'delayed', 'active', 'waiting-children', 'completed', 'failed', 'cancelled', 'unknown'] as const;
export type JobState = (typeof JOB_STATES)[number];
/** States after which a job never changes again. */
export const FINAL_JOB_STATES: ReadonlySet<string> = new Set<JobState>(['completed', 'failed', 'cancelled']);

/** A job's status for clients. */
export interface JobStatus {
  id: string;
  kind: 'retarget';
  state: JobState;
  priority: Priority;
  submittedBy: string;
  submittedAt: string;
  reason: string;
  spacecraftName: string;
  problemHash?: string;
  attemptsMade: number;
  progress: JobProgress | null;
  startedAt: string | null;
  finishedAt: string | null;
  /** Present when completed. */
  result: Omit<RetargetJobResult, 'plan'> | null;
  /** Present when failed or cancelled: error kind, field (when known) and message. */
  error: FailureData | null;
  cancelRequested: boolean;
}

/**
 * zod schemas of what the routes take and return (request schemas validate; response schemas document the
 * OpenAPI side). The problem itself is the planner's one schema, reached through queue/'s jobRequestSchema.
 */
import * as z from 'zod';
import { freeTextSchema } from './free-text.ts';
import { JOB_STATES, PRIORITIES, idempotencyKeySchema, jobRequestSchema, type JobStatus } from './job-types.ts';
import type { BudgetJobStatus } from './budget-job-types.ts';

export { jobRequestSchema };

/** Ids of jobs (`j-<uuid>` or `k-<hex>`) and plans: a conservative token. */
export const idSchema = z.string().regex(/^[A-Za-z0-9_.:-]{1,128}$/, { error: 'must be 1–128 of A-Z a-z 0-9 _ . : -' });

export const jobParamsSchema = z.object({ jobId: idSchema }).strict();
export const planParamsSchema = z.object({ planId: idSchema }).strict();

export const submitHeadersNote = 'An `Idempotency-Key` header may be given instead of the body field (same rules).';
export { idempotencyKeySchema };

export const cancelBodySchema = z.object({
  reason: freeTextSchema({ trim: true, min: 1, max: 500, multiline: true, visible: true }).default('cancelled on request'),
}).strict();

const progressSchema = z.object({
  /** A retarget job's stages are the plan's; a budget job's are nominal, linear, nonlinear, summary, done. */
  stage: z.enum(['validating', 'correcting', 'cross-checking', 'dispersion', 'nominal', 'linear', 'nonlinear', 'summary', 'done']),
  fraction: z.number().min(0).max(1),
  message: z.string(),
  iteration: z.number().int().optional(),
  samplesDone: z.number().int().optional(),
  samplesTotal: z.number().int().optional(),
  at: z.string(),
});

export const jobStatusSchema = z.object({
  id: z.string(),
  kind: z.literal('retarget'),
  state: z.enum(JOB_STATES),
  priority: z.enum(PRIORITIES),
  submittedBy: z.string(),
  submittedAt: z.string(),
  reason: z.string(),
  spacecraftName: z.string(),
  problemHash: z.string().optional(),
  attemptsMade: z.number().int(),
  progress: progressSchema.nullable(),
  startedAt: z.string().nullable(),
  finishedAt: z.string().nullable(),
  result: z.object({
    planId: z.string(), planStatus: z.enum(['converged', 'not-converged']), problemHash: z.string(), storedIn: z.string(),
  }).nullable(),
  error: z.object({ name: z.string(), code: z.string(), field: z.string().optional(), message: z.string() }).nullable(),
  cancelRequested: z.boolean(),
});
/** Compiles only when T fits U: the compile-time check that a documented schema takes what the queue returns. */
type Fits<T extends U, U> = T;
/** The queue's JobStatus fits the documented status schema (a compile-time check). */
export type JobStatusFitsSchema = Fits<JobStatus, z.infer<typeof jobStatusSchema>>;

/** A budget job's status: the job view with the study's id and the linear/non-linear agreement. */
export const budgetJobStatusSchema = jobStatusSchema.extend({
  kind: z.literal('delta-v-budget'),
  result: z.object({
    kind: z.literal('delta-v-budget'), studyId: z.string(), problemHash: z.string(), storedIn: z.string(), agreementPassed: z.boolean().nullable(),
  }).nullable(),
});
/** The queue's BudgetJobStatus fits the documented budget status schema (a compile-time check). */
export type BudgetJobStatusFitsSchema = Fits<BudgetJobStatus, z.infer<typeof budgetJobStatusSchema>>;

/** Either kind of top-level job, as `/v1/jobs` lists them. */
export const anyJobStatusSchema = z.discriminatedUnion('kind', [jobStatusSchema, budgetJobStatusSchema]);

export const submitResponseSchema = z.object({
  jobId: z.string(),
  /** `created` (202), `existing` (200: same key, same request). */
  outcome: z.enum(['created', 'existing']),
  statusUrl: z.string(),
  eventsUrl: z.string(),
});

export const jobListQuerySchema = z.object({
  state: z.enum(['waiting', 'delayed', 'active', 'waiting-children', 'completed', 'failed']).optional(),
  limit: z.coerce.number().int().min(1).max(200).default(50),
  offset: z.coerce.number().int().min(0).max(100_000).default(0),
}).strict();

export const planListQuerySchema = z.object({
  state: z.enum(['proposed', 'approved', 'rejected', 'superseded']).optional(),
  spacecraft: freeTextSchema({ min: 1, max: 80 }).optional(),
  from: z.iso.datetime({ error: 'must be an ISO 8601 UTC time, e.g. 2030-01-01T00:00:00Z' }).optional(),
  to: z.iso.datetime({ error: 'must be an ISO 8601 UTC time, e.g. 2030-01-01T00:00:00Z' }).optional(),
  converged: z.enum(['true', 'false']).transform((v) => v === 'true').optional(),
  limit: z.coerce.number().int().min(1).max(1000).default(100),
  offset: z.coerce.number().int().min(0).max(1_000_000).default(0),
}).strict();

export const planSummarySchema = z.object({
  planId: z.string(),
  jobId: z.string(),
  spacecraftName: z.string(),
  state: z.enum(['proposed', 'approved', 'rejected', 'superseded']),
  converged: z.boolean(),
  crossCheckPassed: z.boolean(),
  caveatCodes: z.array(z.string()),
  submittedBy: z.string(),
  proposedAt: z.string(),
  /** Present when the plan table disagrees with the archive entries: the fields above then follow the entries. */
  inconsistency: z.string().optional(),
});

/** One plan in GET /v1/plans and GET /v1/plans/:id. */
export type PlanSummary = z.infer<typeof planSummarySchema>;

export const planResponseSchema = z.object({
  summary: planSummarySchema,
  /** The full plan document as the planner produced it (ManeuverPlan, planFormatVersion 1). */
  plan: z.record(z.string(), z.unknown()).describe('ManeuverPlan (planFormatVersion 1): burns, targets, cross-check, dispersion, caveats, trajectory'),
  notice: z.string(),
});

export const healthSchema = z.object({ status: z.literal('ok') });
export const readySchema = z.object({
  ready: z.boolean(),
  redis: z.object({ ok: z.boolean(), latencyMs: z.number().nullable(), error: z.string().optional() }),
  workers: z.object({ ok: z.boolean(), count: z.number().int() }),
  /** The leap-second table UTC epochs are read with; `expired` never makes the service unready (past the
   * expiry plans carry a caveat instead). */
  leapSeconds: z.object({
    source: z.enum(['built-in', 'file']), path: z.string().nullable(), sha256: z.string().nullable(),
    expiresUtc: z.string(), expired: z.boolean(),
  }),
});

/** Shown with every plan. */
export const REVIEW_NOTICE = 'PROPOSAL ONLY: this maneuver plan must be reviewed and approved by qualified flight-dynamics staff, '
  + 'verified independently, and handled under the mission\'s own procedures before anything is commanded.';

/**
 * Public face of queue/: the retarget queue (producer side for the API), the worker, job shapes and
 * configuration. queue/ imports planner/ and archive/ only, and knows nothing of HTTP.
 *
 * The API gets the planner's problem schema through `jobRequestSchema` here (it embeds `problemSchema`),
 * so api/ never imports planner/.
 */
export {
  JOB_NAMES, JOB_STATES, PRIORITIES, RETARGET_QUEUE, BULL_PRIORITY, idempotencyKeySchema, jobRequestSchema,
  type JobProgress, type JobRequest, type JobRequestInput, type JobState, type JobStatus, type Priority,
  type RetargetJobData, type RetargetJobResult, type SampleBatchData, type SampleBatchResult,
} from '../contract/job-types.ts';
export { RetargetQueue, isIssuedJobId, parseFailure, type CancelOutcome, type JobCounts, type RetargetQueueOptions, type SubmitOutcome } from './retarget-queue.ts';
export { QueueUnavailableError, QUEUE_RETRY_AFTER_S, isQueueUnavailable } from './queue-unavailable.ts';
export { JobEventHub, type JobEvent } from './job-events.ts';
export { startRetargetWorker, type RetargetWorker, type RetargetWorkerOptions } from './retarget-worker.ts';
export { ArchivePlanSink, JobResultSink, type ArchiveAppends, type PlanSink, type ProposedPlanInput } from './plan-sink.ts';
export { createPlanSink } from './sink-from-config.ts';
export { startWorkerFromConfig } from './worker-from-config.ts';
export { PlannerPool, type PlannerPoolOptions } from './planner-pool.ts';
export { isFinalFailure, sampleBatches } from './processor.ts';
export { findBudgetIssue, findProblemIssue, type ProblemIssue } from './job-request-check.ts';
export { loadServiceLeapSeconds, leapSecondsExpired, leapSecondsExpiryMs, logLeapSecondsAtStart } from './leap-seconds-file.ts';
export { ConfigError, parseEnv, envInt, redisUrlSchema, postgresUrlSchema, logLevelSchema } from '../contract/env-config.ts';
export { loadWorkerConfig, workerEnvSchema, type WorkerConfig } from './worker-config.ts';
export { createRedis } from './connection.ts';
export { createLogger } from './logger.ts';
export { CANCELLED_REASON_PREFIX, TIME_LIMIT_REASON_PREFIX, cancelKey, type CancelRecord } from './cancellation.ts';
export { startLocalRedis, INSTALL_REDIS_HINT, type LocalRedis } from './local-redis.ts';
export {
  BUDGET_JOB_NAMES, budgetJobRequestSchema, type BudgetJobData, type BudgetJobRequest, type BudgetJobResult, type BudgetJobStatus,
  type BudgetBatchData, type BudgetBatchResult,
} from '../contract/budget-job-types.ts';

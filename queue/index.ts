/**
 * Public face of queue/: the retarget queue (producer side for the API), the worker, job shapes and
 * configuration. queue/ imports planner/, archive/ and ccsds/ (to read the service's OEM ephemeris sets), and
 * knows nothing of HTTP.
 *
 * The API gets the planner's problem schema through `jobRequestSchema` here (it embeds `problemSchema`),
 * so api/ never imports planner/.
 */
export {
  JOB_NAMES, JOB_STATES, PRIORITIES, RETARGET_QUEUE, BULL_PRIORITY, idempotencyKeySchema, jobRequestSchema,
  type JobProgress, type JobRequest, type JobRequestInput, type JobState, type JobStatus, type Priority,
  type RetargetJobData, type RetargetJobResult, type SampleBatchData, type SampleBatchResult,
} from '../contract/job-types.ts';
export { RetargetQueue, isIssuedJobId, type CancelOutcome, type JobCounts, type RetargetQueueOptions, type SubmitOutcome } from './producer/retarget-queue.ts';
export { DEFAULT_ADMISSION, REDIS_BYTES_PER_JOB, type AdmissionLimits, type AdmissionRefusal } from './producer/admission.ts';
export { QueueUnavailableError, QUEUE_RETRY_AFTER_S, isQueueUnavailable } from './producer/queue-unavailable.ts';
export { JobEventHub, type JobEvent } from './producer/job-events.ts';
export { startRetargetWorker, type RetargetWorker, type RetargetWorkerOptions } from './worker/retarget-worker.ts';
export { ArchivePlanSink, JobResultSink, recordRemovedJob, type ArchiveAppends, type PlanSink, type ProposedPlanInput } from './worker/plan-sink.ts';
export { createPlanSink, startWorkerFromConfig } from './worker/start-from-config.ts';
export { PlannerPool, type PlannerPoolOptions } from './worker/planner-pool.ts';
export { isFinalFailure, sampleBatches } from './worker/job-run.ts';
export { findBudgetIssue, findProblemIssue, type ProblemIssue } from './producer/job-request-check.ts';
export { loadServiceLeapSeconds, leapSecondsExpired, leapSecondsExpiryMs, logLeapSecondsAtStart } from './worker/leap-seconds-file.ts';
export { ConfigError, parseEnv, envInt, redisUrlSchema, postgresUrlSchema, logLevelSchema } from '../contract/env-config.ts';
export {
  EPHEMERIS_SET_FIELD, checkEphemerisSetCovers, ephemerisSetFiles, loadEphemerisSets, logEphemerisSetsAtStart, type EphemerisSet, type EphemerisSetFileRef,
  type EphemerisSets,
} from './config/ephemeris-sets.ts';
export { loadWorkerConfig, workerEnvSchema, type WorkerConfig } from './config/worker-config.ts';
export { createRedis } from './config/connection.ts';
export { createLogger } from './config/logger.ts';
export { cancelKey, type CancelRecord } from './cancellation.ts';
export { startLocalRedis, INSTALL_REDIS_HINT, type LocalRedis } from './config/local-redis.ts';
export {
  BUDGET_JOB_NAMES, budgetJobRequestSchema, type BudgetJobData, type BudgetJobRequest, type BudgetJobResult, type BudgetJobStatus, type AnyJobStatus,
  type BudgetBatchData, type BudgetBatchResult,
} from '../contract/budget-job-types.ts';

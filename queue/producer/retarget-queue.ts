/**
 * The producer side of the retarget queue, used by the API: submit (idempotent), status, cancel, counts.
 * Knows nothing of HTTP; returns outcomes the API maps to status codes.
 */
import { randomUUID } from 'node:crypto';
import { Queue, type JobState as BullState } from 'bullmq';
import type { Redis } from 'ioredis';
import { canonicalHash, sha256Hex } from '../../archive/index.ts';
import { budgetRequestHash, planLeapSeconds, problemHash, type PlanningProblem } from '../../planner/index.ts';
import {
  BUDGET_JOB_NAMES, type BudgetJobData, type BudgetJobRequest, type BudgetJobResult, type BudgetJobStatus, type AnyJobStatus,
} from '../../contract/budget-job-types.ts';
import { BUILTIN_LEAP_SECONDS, type LeapSecondTable } from '../../propagator/index.ts';
import { cancelKey, readCancel, requestCancel, type CancelRecord } from '../cancellation.ts';
import type { FailureData } from '../../contract/errors.ts';
import { createRedis } from '../config/connection.ts';
import type { Priority } from '../../contract/index.ts';
import type { PlanLeapSeconds } from '../../contract/plan-types.ts';
import { DEFAULT_ADMISSION, submitterJobsKey, unfinishedJobsOf, type AdmissionLimits, type AdmissionRefusal } from './admission.ts';
import { isTopLevelJob, type QueuedJob, type TopLevelJob } from './queued-job.ts';
import { QueueUnavailableError } from './queue-unavailable.ts';
import { sendInOneWrite } from './one-write.ts';
import { SharedReads } from './shared-read.ts';
import { cancelledBeforeRunStatus, clientState, describeBudgetJob, describeJob, fanOutProgress } from './job-status.ts';
import {
  BULL_PRIORITY, JOB_NAMES, RETARGET_QUEUE, type JobProgress, type JobRequest, type JobState, type JobStatus,
  type RetargetJobData, type RetargetJobResult,
} from '../../contract/job-types.ts';

export interface RetargetQueueOptions {
  redisUrl: string;
  prefix: string;
  /** Tries for transient failures. @defaultValue 3 */
  attempts?: number;
  /** Seconds finished jobs are kept. @defaultValue 7 days */
  retentionS?: number;
  /** The table the API validated problems with; it travels with each job so the worker plans with it.
   * @defaultValue BUILTIN_LEAP_SECONDS */
  leapSeconds?: LeapSecondTable;
  /** Queue-depth limits checked before a new job is added. @defaultValue DEFAULT_ADMISSION */
  admission?: AdmissionLimits;
}

/** `created`: a new job (HTTP 202). `existing`: same key, same request (200). `conflict`: same key, other request (409). */
export type SubmitOutcome =
  | { outcome: 'created'; jobId: string }
  | { outcome: 'existing'; jobId: string }
  | { outcome: 'conflict'; jobId: string }
  | AdmissionRefusal;

export type CancelOutcome =
  /** `removed`: the data of the job removed before any worker ran it (its submission is recorded from it). */
  | { outcome: 'cancelled'; jobId: string; removed: RetargetJobData | BudgetJobData }
  | { outcome: 'cancelling'; jobId: string }
  | { outcome: 'already-finished'; jobId: string; state: JobState }
  | { outcome: 'not-found'; jobId: string };

/** Job counts by client-facing state. */
export type JobCounts = Record<'waiting' | 'delayed' | 'active' | 'waiting-children' | 'completed' | 'failed', number>;

/**
 * The job ids this queue issues: `j-<uuid>`, `k-<40 hex>` (idempotency key) and sample batches
 * `<parent>-mc-<firstIndex>`. Any other spelling cannot name a job, and must not reach BullMQ: ids such as
 * `id`, `events` or `completed` are the queue's own Redis keys (of other types), which it would read as a job.
 */
const ISSUED_JOB_ID = /^(?:j-[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}|k-[0-9a-f]{40})(?:-mc-\d{1,9})?$/;

/** True when `jobId` has the shape of an id this queue issues (not that such a job exists). */
export function isIssuedJobId(jobId: string): boolean {
  return ISSUED_JOB_ID.test(jobId);
}

/** Job data fields only a submission with an idempotency key carries (set by `enqueue`). */
type KeyedFields = 'idempotencyKey' | 'requestHash';
/** Job data of either kind without them (what the submit methods build). */
type UnkeyedData = Omit<RetargetJobData, KeyedFields> | Omit<BudgetJobData, KeyedFields>;

export class RetargetQueue {
  readonly queue: Queue<QueuedJob>;
  readonly redis: Redis;
  private readonly attempts: number;
  private readonly retentionS: number;
  private readonly admission: AdmissionLimits;
  /** The leap-second table's record every job carries: the table is fixed for this queue, so built once. */
  private readonly leapSecondsRecord: PlanLeapSeconds;
  /** Admission counts shared by the submissions that need them while a read is in flight (shared-read.ts). */
  private readonly waitingReads = new SharedReads<number>();
  private readonly unfinishedReads = new SharedReads<number>();

  constructor(private readonly opts: RetargetQueueOptions) {
    this.redis = createRedis(opts.redisUrl, { failFast: true, name: 'veer-producer' });
    this.queue = new Queue(RETARGET_QUEUE, { connection: this.redis, prefix: opts.prefix });
    // Connection trouble shows in /ready and in failed requests; no log line per reconnect attempt.
    this.queue.on('error', () => {});
    this.attempts = opts.attempts ?? 3;
    this.retentionS = opts.retentionS ?? 7 * 86_400;
    this.admission = opts.admission ?? DEFAULT_ADMISSION;
    this.leapSecondsRecord = planLeapSeconds(this.leapSeconds);
  }

  get prefix(): string { return this.opts.prefix; }

  /** The leap-second table problems are validated with and that each job carries to the worker. */
  get leapSeconds(): LeapSecondTable { return this.opts.leapSeconds ?? BUILTIN_LEAP_SECONDS; }

  /** The submitted job (retarget or budget) with this id, or undefined when there is none, the id is not one
   * this queue issues, or it names a sample batch. */
  async findJob(jobId: string): Promise<TopLevelJob | undefined> {
    this.assertConnected();
    if (!isIssuedJobId(jobId)) return undefined;
    const job = await this.queue.getJob(jobId);
    return job && isTopLevelJob(job) ? job : undefined;
  }

  /**
   * Enqueues a validated request. With an idempotency key the job id is derived from (submitter, key), so a
   * repeat finds the first job; the stored request hash tells a true repeat from a key reused for other work.
   */
  async submit(request: JobRequest, submittedBy: string): Promise<SubmitOutcome> {
    this.assertConnected();
    const leapSeconds = this.leapSecondsRecord;
    const hashOfProblem = problemHash(request.problem as PlanningProblem, leapSeconds);
    return this.enqueue(JOB_NAMES.retarget, request.idempotencyKey, submittedBy, request.priority,
      () => ({ problemHash: hashOfProblem, reason: request.reason, priority: request.priority }),
      (submissionId) => ({
        problem: request.problem, reason: request.reason, priority: request.priority, submittedBy,
        submittedAt: new Date().toISOString(), submissionId, step: 'plan', problemHash: hashOfProblem, leapSeconds,
      } satisfies Omit<RetargetJobData, KeyedFields>));
  }

  /**
   * Enqueues a validated Δv budget request as a `budget` job (same idempotency rules as `submit`). The study
   * it yields is never a plan.
   */
  async submitBudget(request: BudgetJobRequest, submittedBy: string): Promise<SubmitOutcome> {
    this.assertConnected();
    const problem = request.request.problem as PlanningProblem;
    const leapSeconds = this.leapSecondsRecord;
    const hashOfProblem = problemHash(problem, leapSeconds);
    return this.enqueue(BUDGET_JOB_NAMES.budget, request.idempotencyKey, submittedBy, request.priority,
      () => ({ kind: 'budget', budgetHash: budgetRequestHash(request.request), reason: request.reason, priority: request.priority }),
      (submissionId) => ({
        problem, budget: request.request, reason: request.reason, priority: request.priority, submittedBy,
        submittedAt: new Date().toISOString(), submissionId, step: 'prepare', problemHash: hashOfProblem, leapSeconds,
      } satisfies Omit<BudgetJobData, KeyedFields>));
  }

  /**
   * Adds a job of kind `name` with the idempotency handling shared by both kinds. With a key, the job also
   * carries the key and the hash of `requestOf()` (what tells a true repeat from a key reused for other work);
   * without one no later submission can name the job, so neither is computed nor stored.
   */
  private async enqueue(name: TopLevelJob['name'], idempotencyKey: string | undefined, submittedBy: string, priority: Priority,
    requestOf: () => Record<string, unknown>, dataOf: (submissionId: string) => UnkeyedData,
  ): Promise<SubmitOutcome> {
    const requestHash = idempotencyKey === undefined ? undefined : canonicalHash(requestOf());
    const jobId = idempotencyKey
      ? `k-${sha256Hex(`${submittedBy}\n${idempotencyKey}`).slice(0, 40)}`
      : `j-${randomUUID()}`;
    if (idempotencyKey) {
      // The job and a cancel record are read in one wait (one write): the record matters only when no job is left.
      sendInOneWrite(this.redis);
      const [existing, cancelled] = await Promise.all([this.findJob(jobId), readCancel(this.redis, this.prefix, jobId)]);
      if (existing) return { outcome: existing.data.requestHash === requestHash ? 'existing' : 'conflict', jobId };
      // Cancelled before it ran (no job left): the record keeps the request hash to answer the same way.
      if (cancelled) {
        const same = cancelled.requestHash === undefined || cancelled.requestHash === requestHash;
        return { outcome: same ? 'existing' : 'conflict', jobId };
      }
    }
    const refusal = await this.admit(priority, submittedBy);
    if (refusal) return refusal;
    const submissionId = randomUUID();
    const submitterKey = submitterJobsKey(this.prefix, submittedBy);
    // The job and its id in the submitter's set go in one wait: an id whose job is not there yet only counts
    // as finished to a concurrent count at the limit (the overshoot admission.ts allows for). The three
    // commands leave in one socket write.
    sendInOneWrite(this.redis);
    await Promise.all([
      this.queue.add(name, { ...dataOf(submissionId), ...(idempotencyKey ? { idempotencyKey, requestHash } : {}) }, {
        jobId,
        priority: priority === 'urgent' ? BULL_PRIORITY.urgent : BULL_PRIORITY.routine,
        attempts: this.attempts,
        backoff: { type: 'exponential', delay: 2_000 },
        removeOnComplete: { age: this.retentionS },
        removeOnFail: { age: this.retentionS },
      }),
      // Two plain commands, not MULTI: no atomicity is needed, and an ioredis pipeline costs more to build.
      this.redis.sadd(submitterKey, jobId),
      this.redis.expire(submitterKey, this.retentionS),
    ]);
    if (!idempotencyKey) return { outcome: 'created', jobId };
    // Two concurrent first submissions with one key: BullMQ keeps the first; tell the second apart.
    const stored = await this.findJob(jobId);
    if (!stored || stored.data.submissionId === submissionId) return { outcome: 'created', jobId };
    return { outcome: stored.data.requestHash === requestHash ? 'existing' : 'conflict', jobId };
  }

  /** The refusal when `priority` has too many waiting jobs or `submittedBy` too many unfinished ones; else null. */
  private async admit(priority: Priority, submittedBy: string): Promise<AdmissionRefusal | null> {
    const limits = this.admission;
    const bullPriority = priority === 'urgent' ? BULL_PRIORITY.urgent : BULL_PRIORITY.routine;
    // Both counts in one wait (two round trips in flight at once), sent in one socket write; a submission
    // arriving while a count it needs is being read shares that read (admission.ts: the overshoot this allows).
    sendInOneWrite(this.redis);
    const [waiting, unfinished] = await Promise.all([
      this.waitingReads.get(String(bullPriority), async () => (await this.queue.getCountsPerPriority([bullPriority]))[bullPriority] ?? 0),
      this.unfinishedReads.get(submittedBy, () => unfinishedJobsOf(this.redis, this.prefix, this.queue.qualifiedName, submittedBy, limits.unfinishedPerSubmitter)),
    ]);
    const limit = limits.waitingPerPriority[priority];
    if (waiting >= limit) return { outcome: 'queue-full', priority, waiting, limit, retryAfterS: limits.retryAfterS };
    if (unfinished >= limits.unfinishedPerSubmitter) {
      return { outcome: 'submitter-full', submitter: submittedBy, unfinished, limit: limits.unfinishedPerSubmitter, retryAfterS: limits.retryAfterS };
    }
    return null;
  }

  /** A budget job's status (with its study's id when done), or undefined when there is no such budget job. */
  async budgetStatus(jobId: string): Promise<BudgetJobStatus | undefined> {
    this.assertConnected();
    if (!isIssuedJobId(jobId)) return undefined;
    const { job, state } = await this.snapshot(jobId);
    if (!job || job.name !== BUDGET_JOB_NAMES.budget) {
      const removed = cancelledBeforeRunStatus(jobId, await readCancel(this.redis, this.prefix, jobId), 'delta-v-budget');
      return removed ? { ...removed, kind: 'delta-v-budget', result: null } : undefined;
    }
    const status = describeBudgetJob(job, state, await readCancel(this.redis, this.prefix, jobId));
    if (state === 'waiting-children') status.progress = await fanOutProgress(job, job.data.budget.nonlinearSamples, 'non-linear budget samples', 'nonlinear') ?? status.progress;
    return status;
  }

  /** The finished budget job's result (with the study when no archive holds it). */
  async budgetResult(jobId: string): Promise<BudgetJobResult | undefined> {
    const job = await this.findJob(jobId);
    if (!job || job.name !== BUDGET_JOB_NAMES.budget) return undefined;
    return job.returnvalue ?? undefined;
  }

  /** A retarget job's status, or undefined when unknown (never submitted, or expired). */
  async status(jobId: string): Promise<JobStatus | undefined> {
    this.assertConnected();
    if (!isIssuedJobId(jobId)) return undefined;
    const { job, state } = await this.snapshot(jobId);
    const cancel = await readCancel(this.redis, this.prefix, jobId);
    if (!job || job.name !== JOB_NAMES.retarget) return cancelledBeforeRunStatus(jobId, cancel, 'retarget');
    const status = describeJob(job, state, cancel);
    if (state === 'waiting-children') status.progress = await fanOutProgress(job) ?? status.progress;
    return status;
  }

  /**
   * The job and its state, consistent: reading the job and then its state can see a job that finished in
   * between (state completed, no result yet), so a finished state is followed by a fresh read of the job.
   */
  private async snapshot(jobId: string): Promise<{ job: TopLevelJob | undefined; state: string }> {
    let job = await this.findJob(jobId);
    if (!job) return { job, state: 'unknown' };
    const state = await job.getState();
    if ((state === 'completed' || state === 'failed') && !job.finishedOn) job = await this.findJob(jobId);
    return { job, state };
  }

  /** The finished job's result (with the plan when no archive holds it). */
  async result(jobId: string): Promise<RetargetJobResult | undefined> {
    const job = await this.findJob(jobId);
    return job?.name === JOB_NAMES.retarget ? job.returnvalue ?? undefined : undefined;
  }

  /**
   * Cancels a job: a waiting one is removed at once (`cancelled`); a running one is told to stop
   * (`cancelling`; it ends failed with a CancelledError reason, reported as `cancelled`).
   */
  async cancel(jobId: string, by: string, reason: string): Promise<CancelOutcome> {
    this.assertConnected();
    if (!isIssuedJobId(jobId)) return { outcome: 'not-found', jobId };
    const job = await this.findJob(jobId);
    if (!job || (job.name !== JOB_NAMES.retarget && job.name !== BUDGET_JOB_NAMES.budget)) {
      const earlier = await readCancel(this.redis, this.prefix, jobId);
      return earlier ? { outcome: 'already-finished', jobId, state: 'cancelled' } : { outcome: 'not-found', jobId };
    }
    const state = await job.getState();
    if (state === 'completed' || state === 'failed') {
      const cancel = await readCancel(this.redis, this.prefix, jobId);
      return { outcome: 'already-finished', jobId, state: clientState(state, job, cancel) };
    }
    const record: CancelRecord = { by, at: new Date().toISOString(), reason, requestHash: job.data.requestHash };
    if (state === 'waiting' || state === 'prioritized' || state === 'delayed') {
      record.removedWhileWaiting = {
        submittedBy: job.data.submittedBy, submittedAt: job.data.submittedAt, reason: job.data.reason,
        priority: job.data.priority, spacecraftName: job.data.problem.spacecraft.name,
        kind: job.name === BUDGET_JOB_NAMES.budget ? 'delta-v-budget' : 'retarget',
      };
      await requestCancel(this.redis, this.prefix, jobId, record, this.retentionS);
      try {
        await job.remove();
        return { outcome: 'cancelled', jobId, removed: job.data };
      } catch {
        // It became active meanwhile (a locked job cannot be removed): the worker sees the marker.
        delete record.removedWhileWaiting;
      }
    }
    await requestCancel(this.redis, this.prefix, jobId, record, this.retentionS);
    return { outcome: 'cancelling', jobId };
  }

  /** Counts of jobs by state (both job kinds). */
  async counts(): Promise<JobCounts> {
    this.assertConnected();
    const c = await this.queue.getJobCounts('waiting', 'prioritized', 'delayed', 'active', 'waiting-children', 'completed', 'failed');
    return {
      waiting: (c.waiting ?? 0) + (c.prioritized ?? 0), delayed: c.delayed ?? 0, active: c.active ?? 0,
      'waiting-children': c['waiting-children'] ?? 0, completed: c.completed ?? 0, failed: c.failed ?? 0,
    };
  }

  /** Workers connected to the queue now (BullMQ lists them by their Redis client names). */
  async workerCount(): Promise<number> {
    this.assertConnected();
    return (await this.queue.getWorkers()).length;
  }

  /** Round trip to Redis, ms; throws when Redis does not answer. */
  async ping(): Promise<number> {
    this.assertConnected();
    const t0 = performance.now();
    await this.redis.ping();
    return performance.now() - t0;
  }

  /** Lists recent top-level jobs of both kinds (retarget and budget; not sample batches), newest first, in the
   * given BullMQ states. */
  async list(states: BullState[], start: number, end: number): Promise<AnyJobStatus[]> {
    this.assertConnected();
    const jobs = await this.queue.getJobs(states, start, end, false);
    const out: AnyJobStatus[] = [];
    for (const job of jobs) {
      if (!job || (job.name !== JOB_NAMES.retarget && job.name !== BUDGET_JOB_NAMES.budget)) continue;
      const state = await job.getState();
      const cancel = await readCancel(this.redis, this.prefix, String(job.id));
      out.push(job.name === BUDGET_JOB_NAMES.budget ? describeBudgetJob(job, state, cancel) : describeJob(job, state, cancel));
    }
    return out;
  }

  async close(): Promise<void> {
    // While Redis is out of reach a graceful close would wait for it: drop the connection first then.
    if (!this.connected) this.redis.disconnect();
    await this.queue.close();
    this.redis.disconnect();
  }

  /** True while the connection to Redis is up. */
  get connected(): boolean { return this.redis.status === 'ready'; }

  /** Refuses at once while Redis is out of reach, rather than queueing the command until it times out. */
  private assertConnected(): void {
    if (!this.connected) throw new QueueUnavailableError(`Redis not reachable (connection ${this.redis.status})`);
  }

  /** Key of the cancel marker (for tests and tools). */
  cancelKey(jobId: string): string { return cancelKey(this.prefix, jobId); }
}

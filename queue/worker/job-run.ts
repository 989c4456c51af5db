/**
 * What every job processor shares (processor.ts: retargeting; budget-processor.ts: Δv budgets): the run's
 * stop control (time limit, cancel requests, shutdown), progress writes, child batches of a fan-out and the
 * wait for them, and how a run that throws ends.
 *
 * A failure is classified once (`jobEnd`) into data, the contract's FailureData { name, code, field, message },
 * which the job's data (for clients), the plan sink (for the archive) and the parent of a child batch read;
 * and into what BullMQ gets: an UnrecoverableError for a final failure (never retried), the error itself for a
 * transient one. BullMQ's failedReason is a line for people and its own tools; nothing parses it back.
 */
import { UnrecoverableError, WaitingChildrenError, type Job, type Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import type { Logger } from 'pino';
import { sampleBatches, type PlanLeapSeconds } from '../../planner/index.ts';
import type { TaskProgress } from './planner-task.ts';
import { failureOf, failureText, isFinalError, type FailureData } from '../../contract/errors.ts';
import { BULL_PRIORITY, type JobProgress, type Priority } from '../../contract/job-types.ts';
import { readCancel } from '../cancellation.ts';
import type { PlanSink } from './plan-sink.ts';
import type { PlannerPool } from './planner-pool.ts';

export { sampleBatches };
import type { EphemerisSets } from '../config/ephemeris-sets.ts';

export interface ProcessorDeps {
  pool: PlannerPool;
  sink: PlanSink;
  redis: Redis;
  prefix: string;
  /** The queue itself, to add sample batches as child jobs. */
  queue: Queue;
  actor: string;
  logger: Logger;
  jobTimeLimitS: number;
  /** The worker's own table (VEER_LEAP_SECONDS or built-in), for jobs queued without one. */
  leapSeconds: PlanLeapSeconds;
  fanOutMinSamples: number;
  batchSize: number;
  retentionS: number;
  /** The service's named ephemeris sets; a job's problem may choose one (forceModel.ephemerisSet). */
  ephemerisSets: EphemerisSets;
  /** Registers a running job so cancel requests reach it (`cancel(by)`); returns the unregister function. */
  track(jobId: string, parentId: string | null, cancel: (by: string) => void): () => void;
}

/** True when a failure with this error must not be retried: the contract's one list (FINAL_ERROR_NAMES). */
export const isFinalFailure = isFinalError;

type StopReason = { kind: 'cancel'; by: string } | { kind: 'time-limit' } | { kind: 'shutdown' };

/** How a run that threw ends: `failure` as data (null while it waits for its children), `final` when no
 * retry can help, `thrown` what BullMQ gets. */
export interface JobEnd { failure: FailureData | null; final: boolean; thrown: Error }

/** The data of a job that can end for good: its failure is kept there for clients. */
interface FailableJobData { failure?: FailureData }

/**
 * Sets up a controller combining BullMQ's signal, cancel requests and the time limit. `deadlineMs` (Unix ms)
 * is the end of the job's overall time: JOB_TIME_LIMIT_S counted from the job's first start, across retries,
 * take-overs and a fanned-out run's sample batches; a run that starts after it stops at once.
 */
export function runControl(deps: ProcessorDeps, jobId: string, parentId: string | null, deadlineMs: number, bullSignal?: AbortSignal) {
  const controller = new AbortController();
  let stop: StopReason | null = null;
  const abort = (reason: StopReason): void => {
    if (controller.signal.aborted) return;
    stop = reason;
    controller.abort(reason.kind === 'cancel' ? `cancelled by ${reason.by}` : reason.kind);
  };
  const timer = setTimeout(() => abort({ kind: 'time-limit' }), Math.max(0, deadlineMs - Date.now()));
  const onBull = (): void => abort({ kind: 'shutdown' });
  bullSignal?.addEventListener('abort', onBull, { once: true });
  const untrack = deps.track(jobId, parentId, (by) => abort({ kind: 'cancel', by }));
  return {
    signal: controller.signal,
    stopReason: (): StopReason | null => stop,
    cancel: (by: string) => abort({ kind: 'cancel', by }),
    dispose: () => { clearTimeout(timer); bullSignal?.removeEventListener('abort', onBull); untrack(); },
  };
}

/** The one classification of a run's error (see the file comment). */
export function jobEnd(error: unknown, stop: StopReason | null, jobTimeLimitS: number): JobEnd {
  if (error instanceof WaitingChildrenError) return { failure: null, final: false, thrown: error };
  let failure: FailureData;
  if (stop?.kind === 'cancel') {
    failure = { name: 'CancelledError', code: 'CANCELLED', message: `cancelled by ${stop.by}` };
  } else if (stop?.kind === 'time-limit') {
    failure = { name: 'TimeLimitError', code: 'TIME_LIMIT', message: `stopped at the time limit of ${jobTimeLimitS} s from the job's first start` };
  } else {
    failure = failureOf(error);
    if (!isFinalError(error)) return { failure, final: false, thrown: error instanceof Error ? error : new Error(String(error)) };
  }
  return { failure, final: true, thrown: new UnrecoverableError(failureText(failure)) };
}

/** True when this end is the job's last: final, or its attempts used up. */
function isLastEnd(job: Job, end: JobEnd): boolean {
  return end.failure !== null && (end.final || job.attemptsMade + 1 >= (job.opts.attempts ?? 1));
}

/** Records a job's failure for good: in its data (what clients read) and in the sink (cancelled or failed). */
async function recordJobFailure(deps: ProcessorDeps, job: Job<FailableJobData> | undefined, jobId: string, failure: FailureData): Promise<void> {
  if (job) await job.updateData({ ...job.data, failure });
  if (failure.name === 'CancelledError') {
    const cancel = await readCancel(deps.redis, deps.prefix, jobId);
    await deps.sink.recordCancelled({ jobId, actor: cancel?.by ?? deps.actor, reason: cancel?.reason ?? failure.message });
  } else {
    await deps.sink.recordFailed({ jobId, actor: deps.actor, failure });
  }
}

/** Records a job's end when this failure is its last (final error or attempts used up). */
export async function recordFinal(deps: ProcessorDeps, job: Job<FailableJobData>, end: JobEnd): Promise<void> {
  if (!end.failure || !isLastEnd(job, end)) return;
  try {
    await recordJobFailure(deps, job, String(job.id), end.failure);
  } catch (e) {
    deps.logger.error({ err: e, jobId: job.id }, 'could not record the job\'s end');
  }
}

/** Writes progress to the job at most every 250 ms (always on a stage change and at the end). */
export function progressWriter(job: Job, logger: Logger) {
  let lastAt = 0;
  let lastStage = '';
  let pending: Promise<unknown> = Promise.resolve();
  return (p: TaskProgress): void => {
    const now = Date.now();
    if (p.stage === lastStage && now - lastAt < 250 && p.stage !== 'done') return;
    lastAt = now;
    lastStage = p.stage;
    const report: JobProgress = { ...p, at: new Date(now).toISOString() };
    pending = pending.then(() => job.updateProgress(report)).catch((e: unknown) => {
      logger.warn({ err: e, jobId: job.id }, 'progress update failed');
    });
  };
}

/** What a parent job's body gets from runParentJob. */
export interface ParentRun {
  jobId: string;
  /** End of the job's overall time (Unix ms), for its child batches. */
  deadlineMs: number;
  signal: AbortSignal;
  report: (p: TaskProgress) => void;
}

/**
 * Runs the body of a parent job (retarget or budget) under its time limit (counted from its first start),
 * cancel requests and progress writes; a throw ends it through jobEnd and recordFinal.
 */
export async function runParentJob<D extends FailableJobData & { firstStartedAt?: string }, R>(deps: ProcessorDeps, job: Job<D>,
  bullSignal: AbortSignal | undefined, body: (run: ParentRun) => Promise<R>): Promise<R> {
  const jobId = String(job.id);
  if (!job.data.firstStartedAt) await job.updateData({ ...job.data, firstStartedAt: new Date().toISOString() });
  const deadlineMs = Date.parse(job.data.firstStartedAt ?? '') + deps.jobTimeLimitS * 1000;
  const control = runControl(deps, jobId, null, deadlineMs, bullSignal);
  try {
    const cancel = await readCancel(deps.redis, deps.prefix, jobId);
    if (cancel) control.cancel(cancel.by);
    if (control.signal.aborted) throw new Error('stopped before start');
    return await body({ jobId, deadlineMs, signal: control.signal, report: progressWriter(job, deps.logger) });
  } catch (error) {
    const end = jobEnd(error, control.stopReason(), deps.jobTimeLimitS);
    await recordFinal(deps, job, end);
    throw end.thrown;
  } finally {
    control.dispose();
  }
}

/**
 * Adds the child jobs `name` covering samples [0, total) in batches of deps.batchSize, as children of `job`
 * (a BullMQ flow; a child's failure fails the parent). Child ids are `<parent>-mc-<firstIndex>`, so re-adding
 * after a crash is a no-op for batches that already exist.
 */
export async function addChildBatches(deps: ProcessorDeps, job: Job<{ priority: Priority }>, name: string, total: number,
  dataOf: (batch: { firstIndex: number; count: number }) => object): Promise<number> {
  const batches = sampleBatches(total, deps.batchSize);
  const priority = job.data.priority === 'urgent' ? BULL_PRIORITY.urgentSamples : BULL_PRIORITY.routineSamples;
  await deps.queue.addBulk(batches.map((b) => ({
    name,
    data: dataOf(b),
    opts: {
      jobId: `${job.id}-mc-${b.firstIndex}`,
      parent: { id: String(job.id), queue: job.queueQualifiedName },
      failParentOnFailure: true,
      priority,
      attempts: job.opts.attempts ?? 1,
      backoff: { type: 'exponential', delay: 1000 },
      removeOnComplete: { age: deps.retentionS },
      removeOnFail: { age: deps.retentionS },
    },
  })));
  return batches.length;
}

/** Removes the child batch jobs covering [0, total) and the parent's record of their results (once the result is stored they are dead weight). */
export async function releaseChildBatches(deps: ProcessorDeps, job: Job, total: number): Promise<void> {
  for (const b of sampleBatches(total, deps.batchSize)) await deps.queue.remove(`${job.id}-mc-${b.firstIndex}`);
  await deps.redis.del(`${job.queueQualifiedName}:${job.id}:processed`);
}

/**
 * The samples of a parent's child batches, in index order. The first time here (or when the worker died
 * between recording the nominal result and adding the batches) it adds them with `addBatches`, records how
 * many, and moves the parent to wait for them (WaitingChildrenError); BullMQ runs it again once they are done.
 */
export async function collectChildSamples<S>(job: Job<{ batches?: number }>, token: string | undefined, expected: number,
  total: number, addBatches: () => Promise<number>, queued: (batches: number) => void): Promise<S[]> {
  const values = await job.getChildrenValues<{ firstIndex: number; samples: S[] }>();
  if (Object.keys(values).length < expected) {
    const batches = await addBatches();
    await job.updateData({ ...job.data, batches });
    queued(batches);
    if (!token) throw new Error('no lock token to wait for child jobs');
    if (await job.moveToWaitingChildren(token)) throw new WaitingChildrenError();
  }
  const all = await job.getChildrenValues<{ firstIndex: number; samples: S[] }>();
  const samples = Object.values(all).sort((a, b) => a.firstIndex - b.firstIndex).flatMap((b) => b.samples);
  if (samples.length !== total) throw new Error(`expected ${total} samples from child jobs, got ${samples.length}`);
  return samples;
}

/**
 * Runs one fanned-out child batch (`work`) under its parent's deadline and cancellation. A batch that ends
 * for good (cancelled, or failed for the last time) fails its parent (failParentOnFailure), so the parent's
 * end is recorded here, in the parent's data and in the sink.
 */
export async function runChildBatch<T>(deps: ProcessorDeps, job: Job<{ parentId: string; deadlineAt?: string }>, bullSignal: AbortSignal | undefined,
  work: (signal: AbortSignal) => Promise<T>): Promise<T> {
  const { parentId } = job.data;
  // The parent's overall deadline, and never longer than this worker's own limit for one run.
  const ownDeadlineMs = Date.now() + deps.jobTimeLimitS * 1000;
  const parentDeadlineMs = job.data.deadlineAt ? Date.parse(job.data.deadlineAt) : ownDeadlineMs;
  const control = runControl(deps, String(job.id), parentId, Math.min(ownDeadlineMs, parentDeadlineMs), bullSignal);
  try {
    const cancel = await readCancel(deps.redis, deps.prefix, parentId);
    if (cancel) control.cancel(cancel.by);
    if (control.signal.aborted) throw new Error('parent cancelled before this batch started');
    return await work(control.signal);
  } catch (error) {
    const end = jobEnd(error, control.stopReason(), deps.jobTimeLimitS);
    if (end.failure && isLastEnd(job, end)) {
      const parentFailure: FailureData = end.failure.name === 'CancelledError' ? end.failure
        : { ...end.failure, name: 'SampleBatchFailed', code: 'SAMPLE_BATCH_FAILED', message: `batch ${job.id}: ${failureText(end.failure)}` };
      try {
        const parent = (await deps.queue.getJob(parentId)) as Job<FailableJobData> | undefined;
        await recordJobFailure(deps, parent, parentId, parentFailure);
      } catch (e) {
        deps.logger.error({ err: e, jobId: parentId }, 'could not record the parent job\'s end');
      }
    }
    throw end.thrown;
  } finally {
    control.dispose();
  }
}

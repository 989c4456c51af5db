/**
 * The job processors. They run on the worker's event loop but only orchestrate: the numerics run on a
 * planner thread (PlannerPool), so lock renewal, progress and cancellation keep flowing.
 *
 * A `retarget` job: validate → plan (with Monte Carlo in-process, or skipped when it fans out) → if fanned
 * out, add `dispersion-samples` child jobs and wait for them (BullMQ parent/child flow) → combine → store the
 * plan through the PlanSink exactly once (idempotent by job id) → result.
 */
import { UnrecoverableError, WaitingChildrenError, type Job, type Queue } from 'bullmq';
import type { Redis } from 'ioredis';
import type { Logger } from 'pino';
import type { DispersionSample, ManeuverPlan, PlanLeapSeconds, PlanProgress } from '../../planner/index.ts';
import { isFinalError } from '../../contract/errors.ts';
import { CANCELLED_REASON_PREFIX, TIME_LIMIT_REASON_PREFIX, readCancel } from '../cancellation.ts';
import {
  BULL_PRIORITY, JOB_NAMES, type JobProgress, type Priority, type RetargetJobData, type RetargetJobResult,
  type SampleBatchData, type SampleBatchResult,
} from '../../contract/job-types.ts';
import type { PlanSink } from './plan-sink.ts';
import type { PlannerPool } from './planner-pool.ts';

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
  /** Registers a running job so cancel requests reach it (`cancel(by)`); returns the unregister function. */
  track(jobId: string, parentId: string | null, cancel: (by: string) => void): () => void;
}

/** True when a failure with this error must not be retried: the contract's one list (FINAL_ERROR_NAMES). */
export const isFinalFailure = isFinalError;

type StopReason = { kind: 'cancel'; by: string } | { kind: 'time-limit' } | { kind: 'shutdown' };

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

/** Turns an error into what BullMQ should do: UnrecoverableError for final ones, the error itself to retry. */
export function classify(error: unknown, stop: StopReason | null, deps: ProcessorDeps): Error {
  if (error instanceof WaitingChildrenError) return error;
  if (stop?.kind === 'cancel') return new UnrecoverableError(`${CANCELLED_REASON_PREFIX}: cancelled by ${stop.by}`);
  if (stop?.kind === 'time-limit') {
    return new UnrecoverableError(`${TIME_LIMIT_REASON_PREFIX}: stopped at the time limit of ${deps.jobTimeLimitS} s from the job's first start`);
  }
  const e: Error & { field?: string } = error instanceof Error ? error : new Error(String(error));
  if (isFinalFailure(e)) {
    return new UnrecoverableError(`${e.name}${e.field ? ` [${e.field}]` : ''}: ${e.message}`);
  }
  return e;
}

/** Writes progress to the job at most every 250 ms (always on a stage change and at the end). */
export function progressWriter(job: Job, logger: Logger) {
  let lastAt = 0;
  let lastStage = '';
  let pending: Promise<unknown> = Promise.resolve();
  return (p: PlanProgress): void => {
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

/** Sample batches [firstIndex, firstIndex + count) covering [0, total). */
export function sampleBatches(total: number, batchSize: number): { firstIndex: number; count: number }[] {
  const out: { firstIndex: number; count: number }[] = [];
  for (let first = 0; first < total; first += batchSize) out.push({ firstIndex: first, count: Math.min(batchSize, total - first) });
  return out;
}

async function finishPlan(deps: ProcessorDeps, job: Job<RetargetJobData>, plan: ManeuverPlan): Promise<RetargetJobResult> {
  const stored = await deps.sink.storeProposedPlan({
    jobId: String(job.id), actor: deps.actor, submittedBy: job.data.submittedBy, plan,
  });
  deps.logger.info({ jobId: job.id, planId: stored.planId, created: stored.created, status: plan.status }, 'plan stored');
  return {
    planId: stored.planId, planStatus: plan.status, problemHash: plan.problemHash, storedIn: deps.sink.kind,
    ...(deps.sink.keepsPlanInJobResult ? { plan } : {}),
  };
}

/**
 * Once the samples are combined and the plan is stored, their copies in Redis are dead weight (about 1 KB per
 * sample, kept JOB_RETENTION_S): the batch jobs (data and results), the parent's record of their results, and the
 * nominal plan in the parent's data are removed, so a fanned-out run leaves no more behind than a single-process
 * one. Should this run again after a crash, it re-adds the batches and recomputes (same seed, same samples).
 */
async function releaseSampleResults(deps: ProcessorDeps, job: Job<RetargetJobData>): Promise<void> {
  await releaseChildBatches(deps, job, job.data.problem.dispersion.samples);
  const { nominalPlan: _released, ...data } = job.data;
  await job.updateData(data);
}

/** Removes the child batch jobs covering [0, total) and the parent's record of their results (see above). */
export async function releaseChildBatches(deps: ProcessorDeps, job: Job, total: number): Promise<void> {
  for (const b of sampleBatches(total, deps.batchSize)) await deps.queue.remove(`${job.id}-mc-${b.firstIndex}`);
  await deps.redis.del(`${job.queueQualifiedName}:${job.id}:processed`);
}

async function addSampleBatches(deps: ProcessorDeps, job: Job<RetargetJobData>, plan: ManeuverPlan, deadlineMs: number): Promise<number> {
  const { samples, seed } = job.data.problem.dispersion;
  return addChildBatches(deps, job, JOB_NAMES.samples, samples, (b) => ({
    parentId: String(job.id), problem: job.data.problem, plan, seed, firstIndex: b.firstIndex, count: b.count,
    priority: job.data.priority, deadlineAt: new Date(deadlineMs).toISOString(),
  } satisfies SampleBatchData));
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

/** Processes a `retarget` job (see the file comment). */
export async function processRetarget(deps: ProcessorDeps, job: Job<RetargetJobData>, token: string | undefined, bullSignal?: AbortSignal): Promise<RetargetJobResult> {
  const jobId = String(job.id);
  if (!job.data.firstStartedAt) await job.updateData({ ...job.data, firstStartedAt: new Date().toISOString() });
  const deadlineMs = Date.parse(job.data.firstStartedAt ?? '') + deps.jobTimeLimitS * 1000;
  const control = runControl(deps, jobId, null, deadlineMs, bullSignal);
  const report = progressWriter(job, deps.logger);
  try {
    const cancel = await readCancel(deps.redis, deps.prefix, jobId);
    if (cancel) control.cancel(cancel.by);
    if (control.signal.aborted) throw new Error('stopped before start');
    const problem = job.data.problem;
    if (job.data.step === 'plan') {
      const fanOut = problem.dispersion.samples >= deps.fanOutMinSamples && problem.executionErrors !== undefined;
      const planning = deps.pool.run(
        { kind: 'plan', problem, monteCarlo: fanOut ? 'skip' : 'in-process', leapSeconds: job.data.leapSeconds ?? deps.leapSeconds },
        { signal: control.signal, onProgress: report },
      );
      planning.catch(() => undefined); // handled below; avoids an unhandled rejection while the archive write runs
      // Recorded while the planner thread already works (the archive write blocks this loop for a few ms).
      try {
        await deps.sink.recordSubmitted({
          jobId, actor: job.data.submittedBy, problem, problemHash: job.data.problemHash, reason: job.data.reason,
        });
      } catch (error) {
        await planning.catch(() => undefined);
        throw error; // transient (archive unavailable): retried
      }
      const plan = await planning;
      if (!fanOut || plan.status !== 'converged') return await finishPlan(deps, job, plan);
      await job.updateData({ ...job.data, step: 'await-samples', nominalPlan: plan });
    }
    const nominal = job.data.nominalPlan;
    if (!nominal) throw new Error(`job ${jobId} is waiting for samples but holds no nominal plan`);
    const values = await job.getChildrenValues<SampleBatchResult>();
    const expected = sampleBatches(problem.dispersion.samples, deps.batchSize).length;
    if (Object.keys(values).length < expected) {
      // First time here, or the worker died between storing the nominal plan and adding the batches.
      const batches = await addSampleBatches(deps, job, nominal, deadlineMs);
      await job.updateData({ ...job.data, batches });
      report({ stage: 'dispersion', fraction: 0.5, message: `Monte Carlo: ${batches} batches queued`, samplesDone: 0, samplesTotal: problem.dispersion.samples });
      if (!token) throw new Error('no lock token to wait for child jobs');
      if (await job.moveToWaitingChildren(token)) throw new WaitingChildrenError();
    }
    const all = await job.getChildrenValues<SampleBatchResult>();
    const samples: DispersionSample[] = Object.values(all)
      .sort((a, b) => a.firstIndex - b.firstIndex)
      .flatMap((b) => b.samples);
    if (samples.length !== problem.dispersion.samples) {
      throw new Error(`expected ${problem.dispersion.samples} Monte Carlo samples from child jobs, got ${samples.length}`);
    }
    const combined = await deps.pool.run({ kind: 'combine', problem, plan: nominal, samples }, { signal: control.signal });
    report({ stage: 'done', fraction: 1, message: 'plan ready', samplesDone: samples.length, samplesTotal: samples.length });
    const result = await finishPlan(deps, job, combined);
    await releaseSampleResults(deps, job);
    return result;
  } catch (error) {
    const outcome = classify(error, control.stopReason(), deps);
    await recordFinal(deps, job, outcome);
    throw outcome;
  } finally {
    control.dispose();
  }
}

/**
 * Processes a `dispersion-samples` child job: one batch of Monte Carlo samples. A batch that ends for good
 * (cancelled, or failed for the last time) fails its parent (failParentOnFailure), so the parent's end is
 * recorded here.
 */
export async function processSamples(deps: ProcessorDeps, job: Job<SampleBatchData>, bullSignal?: AbortSignal): Promise<SampleBatchResult> {
  const samples = await runChildBatch(deps, job, bullSignal, (signal) => deps.pool.run({
    kind: 'samples', problem: job.data.problem, plan: job.data.plan, seed: job.data.seed,
    firstIndex: job.data.firstIndex, count: job.data.count,
  }, { signal }));
  return { firstIndex: job.data.firstIndex, samples };
}

/**
 * Runs one fanned-out child batch (`work`) under its parent's deadline and cancellation. A batch that ends
 * for good (cancelled, or failed for the last time) fails its parent (failParentOnFailure), so the parent's
 * end is recorded here.
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
    const outcome = classify(error, control.stopReason(), deps);
    const last = outcome instanceof UnrecoverableError || job.attemptsMade + 1 >= (job.opts.attempts ?? 1);
    if (last) {
      try {
        if (control.stopReason()?.kind === 'cancel') {
          const cancel = await readCancel(deps.redis, deps.prefix, parentId);
          await deps.sink.recordCancelled({ jobId: parentId, actor: cancel?.by ?? deps.actor, reason: cancel?.reason ?? outcome.message });
        } else {
          await deps.sink.recordFailed({ jobId: parentId, actor: deps.actor, errorName: 'SampleBatchFailed', message: `batch ${job.id}: ${outcome.message}` });
        }
      } catch (e) {
        deps.logger.error({ err: e, jobId: parentId }, 'could not record the parent job\'s end in the plan sink');
      }
    }
    throw outcome;
  } finally {
    control.dispose();
  }
}

/** Records a job's end in the sink when this failure is its last (final error or attempts used up). */
export async function recordFinal(deps: ProcessorDeps, job: Job, outcome: Error): Promise<void> {
  if (outcome instanceof WaitingChildrenError) return;
  const last = outcome instanceof UnrecoverableError || job.attemptsMade + 1 >= (job.opts.attempts ?? 1);
  if (!last) return;
  try {
    if (outcome.message.startsWith(CANCELLED_REASON_PREFIX)) {
      const cancel = await readCancel(deps.redis, deps.prefix, String(job.id));
      await deps.sink.recordCancelled({ jobId: String(job.id), actor: cancel?.by ?? deps.actor, reason: cancel?.reason ?? outcome.message });
    } else {
      const name = outcome.message.split(':', 1)[0] ?? 'Error';
      await deps.sink.recordFailed({ jobId: String(job.id), actor: deps.actor, errorName: /^[A-Za-z]+$/.test(name) ? name : 'Error', message: outcome.message });
    }
  } catch (e) {
    deps.logger.error({ err: e, jobId: job.id }, 'could not record the job\'s end in the plan sink');
  }
}

/**
 * The retargeting job processors. They run on the worker's event loop but only orchestrate: the numerics run
 * on a planner thread (PlannerPool), so lock renewal, progress and cancellation keep flowing; the shared
 * machinery (time limit, cancellation, failures as data, child batches) is job-run.ts.
 *
 * A `retarget` job: plan (with Monte Carlo in-process, or skipped when it fans out) → if fanned out, add
 * `dispersion-samples` child jobs and wait for them (BullMQ parent/child flow) → combine → store the plan
 * through the PlanSink exactly once (idempotent by job id) → result.
 */
import type { Job } from 'bullmq';
import type { DispersionSample, ManeuverPlan } from '../../planner/index.ts';
import {
  JOB_NAMES, type RetargetJobData, type RetargetJobResult, type SampleBatchData, type SampleBatchResult,
} from '../../contract/job-types.ts';
import {
  addChildBatches, collectChildSamples, releaseChildBatches, runChildBatch, runParentJob, sampleBatches, type ParentRun, type ProcessorDeps,
} from './job-run.ts';
import { ephemerisSetFiles } from '../config/ephemeris-sets.ts';

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

async function addSampleBatches(deps: ProcessorDeps, job: Job<RetargetJobData>, plan: ManeuverPlan, deadlineMs: number): Promise<number> {
  const { samples, seed } = job.data.problem.dispersion;
  return addChildBatches(deps, job, JOB_NAMES.samples, samples, (b) => ({
    parentId: String(job.id), problem: job.data.problem, plan, seed, firstIndex: b.firstIndex, count: b.count,
    priority: job.data.priority, deadlineAt: new Date(deadlineMs).toISOString(),
  } satisfies SampleBatchData));
}

/** The first run of a `retarget` job: plans (the submission recorded meanwhile); a fanned-out converged plan is
 * kept in the job's data as the nominal plan, anything else is stored at once. */
async function planStep(deps: ProcessorDeps, job: Job<RetargetJobData>, run: ParentRun): Promise<RetargetJobResult | null> {
  const { problem } = job.data;
  const fanOut = problem.dispersion.samples >= deps.fanOutMinSamples && problem.executionErrors !== undefined;
  // An unknown set fails the planning (after the submission is recorded, as any other final error).
  const planning = Promise.resolve().then(() => deps.pool.run({
    kind: 'plan', problem, monteCarlo: fanOut ? 'skip' : 'in-process', leapSeconds: job.data.leapSeconds ?? deps.leapSeconds,
    ephemerisFiles: ephemerisSetFiles(deps.ephemerisSets, problem.forceModel.ephemerisSet),
  }, { signal: run.signal, onProgress: run.report }));
  planning.catch(() => undefined); // handled below; avoids an unhandled rejection while the archive write runs
  // Recorded while the planner thread already works (the archive write blocks this loop for a few ms).
  try {
    await deps.sink.recordSubmitted(run.jobId, job.data);
  } catch (error) {
    await planning.catch(() => undefined);
    throw error; // transient (archive unavailable): retried
  }
  const plan = await planning;
  if (!fanOut || plan.status !== 'converged') return finishPlan(deps, job, plan);
  await job.updateData({ ...job.data, step: 'await-samples', nominalPlan: plan });
  return null;
}

/** Processes a `retarget` job (see the file comment). */
export async function processRetarget(deps: ProcessorDeps, job: Job<RetargetJobData>, token: string | undefined, bullSignal?: AbortSignal): Promise<RetargetJobResult> {
  return runParentJob(deps, job, bullSignal, async (run) => {
    if (job.data.step === 'plan') {
      const finished = await planStep(deps, job, run);
      if (finished) return finished;
    }
    const nominal = job.data.nominalPlan;
    if (!nominal) throw new Error(`job ${run.jobId} is waiting for samples but holds no nominal plan`);
    const { problem } = job.data;
    const total = problem.dispersion.samples;
    const samples = await collectChildSamples<DispersionSample>(job, token, sampleBatches(total, deps.batchSize).length, total,
      () => addSampleBatches(deps, job, nominal, run.deadlineMs),
      (batches) => run.report({ stage: 'dispersion', fraction: 0.5, message: `Monte Carlo: ${batches} batches queued`, samplesDone: 0, samplesTotal: total }));
    const combined = await deps.pool.run({ kind: 'combine', problem, plan: nominal, samples }, { signal: run.signal });
    run.report({ stage: 'done', fraction: 1, message: 'plan ready', samplesDone: samples.length, samplesTotal: samples.length });
    const result = await finishPlan(deps, job, combined);
    await releaseSampleResults(deps, job);
    return result;
  });
}

/** Processes a `dispersion-samples` child job: one batch of Monte Carlo samples. */
export async function processSamples(deps: ProcessorDeps, job: Job<SampleBatchData>, bullSignal?: AbortSignal): Promise<SampleBatchResult> {
  const samples = await runChildBatch(deps, job, bullSignal, (signal) => deps.pool.run({
    kind: 'samples', problem: job.data.problem, plan: job.data.plan, seed: job.data.seed,
    firstIndex: job.data.firstIndex, count: job.data.count,
    ephemerisFiles: ephemerisSetFiles(deps.ephemerisSets, job.data.problem.forceModel.ephemerisSet),
  }, { signal }));
  return { firstIndex: job.data.firstIndex, samples };
}

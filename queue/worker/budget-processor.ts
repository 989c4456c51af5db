/**
 * The Δv budget job processors, on the same machinery as retargeting (job-run.ts): time limit,
 * cancellation, progress, final-error classification, and the BullMQ parent/child flow of the Monte Carlo
 * fan-out. A `budget` job: prepare (nominal plan + linear model, on a planner thread) → add
 * `budget-samples` child jobs for the non-linear path and wait → assemble (linear path + statistics) →
 * store the study through the sink once → result. Sample i of a batch depends on (seed, i) only, so the
 * result does not depend on how many workers ran the batches.
 */
import type { Job } from 'bullmq';
import type { BudgetResult, BudgetSample } from '../../planner/index.ts';
import {
  BUDGET_JOB_NAMES, type BudgetBatchData, type BudgetBatchResult, type BudgetJobData, type BudgetJobResult,
} from '../../contract/budget-job-types.ts';
import {
  addChildBatches, collectChildSamples, releaseChildBatches, runChildBatch, runParentJob, sampleBatches, type ProcessorDeps,
} from './job-run.ts';
import { ephemerisSetFiles, type EphemerisSetFileRef } from '../config/ephemeris-sets.ts';

/** The files of the ephemeris set the request's problem names (none for the built-in series): an unknown set
 * is an InvalidInputError, final for the job (the API refuses it before it is queued). */
function setFiles(deps: ProcessorDeps, request: BudgetJobData['budget']): EphemerisSetFileRef[] {
  return ephemerisSetFiles(deps.ephemerisSets, request.problem.forceModel.ephemerisSet);
}

async function finishStudy(deps: ProcessorDeps, job: Job<BudgetJobData>, result: BudgetResult): Promise<BudgetJobResult> {
  const stored = await deps.sink.storeStudy({ jobId: String(job.id), actor: deps.actor, submittedBy: job.data.submittedBy, study: result });
  deps.logger.info({ jobId: job.id, studyId: stored.studyId, created: stored.created }, 'budget study stored');
  return {
    kind: 'delta-v-budget', studyId: stored.studyId, problemHash: result.problemHash, storedIn: deps.sink.kind,
    agreementPassed: result.agreement ? result.agreement.passed : null,
    ...(deps.sink.keepsPlanInJobResult ? { result } : {}),
  };
}

/** Processes a `budget` job (see the file comment). */
export async function processBudget(deps: ProcessorDeps, job: Job<BudgetJobData>, token: string | undefined, bullSignal?: AbortSignal): Promise<BudgetJobResult> {
  return runParentJob(deps, job, bullSignal, async (run) => {
    const request = job.data.budget;
    const total = request.nonlinearSamples;
    if (job.data.step === 'prepare') {
      await deps.sink.recordSubmitted(run.jobId, job.data);
      const leapSeconds = job.data.leapSeconds ?? deps.leapSeconds;
      const prepared = await deps.pool.run({ kind: 'budget-prepare', request, leapSeconds, ephemerisFiles: setFiles(deps, request) }, { signal: run.signal, onProgress: run.report });
      if (!prepared.nominal || total === 0) {
        const result = await deps.pool.run({ kind: 'budget-assemble', request, plan: prepared.plan, nominal: prepared.nominal, nonlinear: [] }, { signal: run.signal });
        return finishStudy(deps, job, result);
      }
      await job.updateData({ ...job.data, step: 'await-samples', nominal: prepared.nominal });
    }
    const nominal = job.data.nominal;
    if (!nominal) throw new Error(`budget job ${run.jobId} is waiting for samples but holds no nominal model`);
    const samples = await collectChildSamples<BudgetSample>(job, token, sampleBatches(total, deps.batchSize).length, total,
      () => addChildBatches(deps, job, BUDGET_JOB_NAMES.samples, total, (b) => ({
        parentId: run.jobId, budget: request, nominal, firstIndex: b.firstIndex, count: b.count,
        priority: job.data.priority, deadlineAt: new Date(run.deadlineMs).toISOString(),
      } satisfies BudgetBatchData)),
      (batches) => run.report({ stage: 'nonlinear', fraction: 0.2, message: `non-linear budget samples: ${batches} batches queued`, samplesDone: 0, samplesTotal: total }));
    run.report({ stage: 'summary', fraction: 0.95, message: 'linear path and statistics', samplesDone: total, samplesTotal: total });
    const result = await deps.pool.run({ kind: 'budget-assemble', request, plan: nominal.plan, nominal, nonlinear: samples }, { signal: run.signal });
    run.report({ stage: 'done', fraction: 1, message: 'budget study ready for review', samplesDone: total, samplesTotal: total });
    const finished = await finishStudy(deps, job, result);
    // As a retarget job does: once the study is stored, the batches and the nominal model are dead weight.
    await releaseChildBatches(deps, job, total);
    const { nominal: _released, ...data } = job.data;
    await job.updateData(data);
    return finished;
  });
}

/** Processes a `budget-samples` child job: one batch of non-linear budget samples. */
export async function processBudgetBatch(deps: ProcessorDeps, job: Job<BudgetBatchData>, bullSignal?: AbortSignal): Promise<BudgetBatchResult> {
  const samples = await runChildBatch(deps, job, bullSignal, (signal) => deps.pool.run({
    kind: 'budget-samples', request: job.data.budget, nominal: job.data.nominal, firstIndex: job.data.firstIndex, count: job.data.count,
    ephemerisFiles: setFiles(deps, job.data.budget),
  }, { signal }));
  return { firstIndex: job.data.firstIndex, samples };
}

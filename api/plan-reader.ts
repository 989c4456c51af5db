/**
 * Where the API reads plans: the archive (when workers append there) or the results of finished jobs
 * (PLAN_SINK=job-result). Both give the same summary shape.
 */
import type { PlanArchive, PlanFilter, PlanRecord } from '../archive/index.ts';
import type { RetargetQueue } from '../queue/index.ts';
import type { PlanSummary } from '../contract/http-schemas.ts';
import { JOB_NAMES } from '../contract/job-types.ts';
import type { ManeuverPlan } from '../contract/plan-types.ts';

export type { PlanSummary };

export interface PlanReader {
  get(planId: string): Promise<{ summary: PlanSummary; plan: ManeuverPlan } | undefined>;
  list(filter: PlanFilter): Promise<PlanSummary[]>;
}

function fromRecord(r: PlanRecord): PlanSummary {
  return {
    planId: r.planId, jobId: r.jobId, spacecraftName: r.spacecraftName, state: r.state, converged: r.converged,
    crossCheckPassed: r.crossCheckPassed, caveatCodes: r.caveatCodes, submittedBy: r.submittedBy, proposedAt: r.proposedAt,
    ...(r.inconsistency ? { inconsistency: r.inconsistency } : {}),
  };
}

export class ArchivePlanReader implements PlanReader {
  constructor(private readonly archive: PlanArchive) {}
  async get(planId: string) {
    const record = await this.archive.getPlan(planId);
    if (!record) return undefined;
    const plan = await this.archive.getPlanDocument(planId);
    return plan ? { summary: fromRecord(record), plan } : undefined;
  }
  async list(filter: PlanFilter) {
    return (await this.archive.listPlans(filter)).map(fromRecord);
  }
}

/** Plans held in finished jobs' results; every such plan is `proposed` (no review without the archive). */
export class JobResultPlanReader implements PlanReader {
  constructor(private readonly queue: RetargetQueue) {}
  async get(planId: string) {
    const job = await this.queue.findJob(planId);
    const plan = job?.name === JOB_NAMES.retarget ? job.returnvalue?.plan : undefined;
    if (!job || !plan || !job.finishedOn) return undefined;
    return { summary: this.summary(job.id ?? planId, job.data.submittedBy, job.finishedOn, plan), plan };
  }
  async list(filter: PlanFilter) {
    const jobs = await this.queue.queue.getJobs(['completed'], 0, 999, false);
    const out: PlanSummary[] = [];
    for (const job of jobs) {
      if (job?.name !== JOB_NAMES.retarget) continue; // only retarget jobs carry plans
      const plan = job.returnvalue?.plan;
      if (!plan || !job.finishedOn) continue;
      const s = this.summary(String(job.id), job.data.submittedBy, job.finishedOn, plan);
      if (filter.state && filter.state !== s.state) continue;
      if (filter.spacecraftName && filter.spacecraftName !== s.spacecraftName) continue;
      if (filter.converged !== undefined && filter.converged !== s.converged) continue;
      if (filter.from && s.proposedAt < filter.from) continue;
      if (filter.to && s.proposedAt >= filter.to) continue;
      out.push(s);
    }
    out.sort((a, b) => (a.proposedAt < b.proposedAt ? 1 : -1));
    return out.slice(filter.offset ?? 0, (filter.offset ?? 0) + (filter.limit ?? 100));
  }
  private summary(jobId: string, submittedBy: string, finishedOn: number, plan: ManeuverPlan): PlanSummary {
    return {
      planId: jobId, jobId, spacecraftName: plan.spacecraftName, state: 'proposed', converged: plan.status === 'converged',
      crossCheckPassed: plan.crossCheck.passed, caveatCodes: plan.caveats.map((c) => c.code), submittedBy,
      proposedAt: new Date(finishedOn).toISOString(),
    };
  }
}

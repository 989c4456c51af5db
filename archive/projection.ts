/**
 * Plan and job records derived from entries. The same functions update the projection tables when an
 * entry is appended and re-derive them from the chain during verification, so the two cannot drift apart
 * except by someone editing the tables directly — which `verify` then reports.
 */
import type {
  ArchiveEntry, JobRecord, PlanProposedPayload, PlanRecord, PlanSupersededPayload, ProjectionMismatch, ReviewPayload,
} from '../contract/archive-types.ts';

/** The plan record a `plan-proposed` entry creates. */
export function planFromProposal(entry: ArchiveEntry): PlanRecord {
  const payload = entry.payload as unknown as PlanProposedPayload;
  const plan = payload.plan;
  return {
    planId: entry.planId ?? '',
    jobId: entry.jobId ?? '',
    spacecraftName: plan.spacecraftName,
    targetSetKey: plan.targetSetKey,
    state: 'proposed',
    converged: plan.status === 'converged',
    crossCheckPassed: plan.crossCheck?.passed === true,
    caveatCodes: plan.caveats.map((c) => c.code),
    submittedBy: payload.submittedBy,
    problemHash: plan.problemHash,
    softwareVersion: plan.softwareVersion,
    proposedAt: entry.at,
    proposedSequence: entry.sequence,
    decidedAt: null,
    decidedBy: null,
    supersededBy: null,
    lastSequence: entry.sequence,
  };
}

/** The plan record after a `review` or `plan-superseded` entry. */
export function applyToPlan(plan: PlanRecord, entry: ArchiveEntry): PlanRecord {
  if (entry.kind === 'review') {
    const payload = entry.payload as unknown as ReviewPayload;
    return { ...plan, state: payload.decision === 'approve' ? 'approved' : 'rejected', decidedAt: entry.at,
      decidedBy: payload.reviewer, lastSequence: entry.sequence };
  }
  if (entry.kind === 'plan-superseded') {
    const payload = entry.payload as unknown as PlanSupersededPayload;
    return { ...plan, state: 'superseded', supersededBy: payload.supersededBy, lastSequence: entry.sequence };
  }
  return plan;
}

/** Job record after an entry about the job. */
export function applyToJob(job: JobRecord | undefined, entry: ArchiveEntry): JobRecord {
  const base: JobRecord = job ?? { jobId: entry.jobId ?? '', submittedBy: null, problemHash: null, state: 'submitted', planId: null,
    lastSequence: entry.sequence };
  switch (entry.kind) {
    case 'job-submitted':
      return { ...base, submittedBy: entry.actor, problemHash: String(entry.payload.problemHash), lastSequence: entry.sequence };
    case 'plan-proposed':
      return { ...base, state: 'proposed', planId: entry.planId, lastSequence: entry.sequence };
    case 'job-failed':
      return { ...base, state: 'failed', lastSequence: entry.sequence };
    case 'job-cancelled':
      return { ...base, state: 'cancelled', lastSequence: entry.sequence };
    default:
      return base;
  }
}

/** Re-derives every plan record from entries fed in order. */
export class ProjectionDeriver {
  readonly plans = new Map<string, PlanRecord>();

  feed(entries: readonly ArchiveEntry[]): void {
    for (const entry of entries) {
      if (entry.kind === 'plan-proposed' && entry.planId) this.plans.set(entry.planId, planFromProposal(entry));
      else if (entry.planId && this.plans.has(entry.planId)) this.plans.set(entry.planId, applyToPlan(this.plans.get(entry.planId)!, entry));
    }
  }

  /** Differences between the derived records and the stored projection (state, deciders, flags). */
  compare(stored: readonly PlanRecord[]): ProjectionMismatch[] {
    const fields = ['state', 'converged', 'crossCheckPassed', 'submittedBy', 'decidedBy', 'supersededBy', 'spacecraftName', 'targetSetKey'] as const;
    const mismatches: ProjectionMismatch[] = [];
    const seen = new Set<string>();
    for (const row of stored) {
      seen.add(row.planId);
      const derived = this.plans.get(row.planId);
      if (!derived) {
        mismatches.push({ planId: row.planId, field: 'planId', derived: null, stored: row.planId });
        continue;
      }
      for (const f of fields) if (derived[f] !== row[f]) mismatches.push({ planId: row.planId, field: f, derived: derived[f], stored: row[f] });
      if (derived.caveatCodes.join('\n') !== row.caveatCodes.join('\n')) {
        mismatches.push({ planId: row.planId, field: 'caveatCodes', derived: derived.caveatCodes, stored: row.caveatCodes });
      }
    }
    for (const planId of this.plans.keys()) if (!seen.has(planId)) mismatches.push({ planId, field: 'planId', derived: planId, stored: null });
    return mismatches;
  }
}

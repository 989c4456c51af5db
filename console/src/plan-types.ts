/** The plan and API shapes the console reads (types only: nothing of the planner's code is bundled). */
export type {
  ManeuverPlan, PlannedBurn, TargetResult, Caveat, PlanBPlane, BPlaneEllipse, TrajectoryPoint, PlanEpoch, CrossCheck,
} from '../../contract/plan-types.ts';

export type Role = 'submitter' | 'reviewer' | 'auditor' | 'admin';
export interface Identity { name: string; roles: Role[] }

export interface JobProgress {
  stage: string; fraction: number; message: string; iteration?: number; samplesDone?: number; samplesTotal?: number; at?: string;
}

/** GET /v1/jobs/:id (api/schemas.ts jobStatusSchema). */
export interface JobStatus {
  id: string;
  state: 'waiting' | 'delayed' | 'active' | 'waiting-children' | 'completed' | 'failed' | 'cancelled' | 'unknown' | 'prioritized';
  priority: string;
  submittedBy: string;
  submittedAt: string;
  reason: string;
  spacecraftName: string;
  progress: JobProgress | null;
  startedAt: string | null;
  finishedAt: string | null;
  result: { planId: string; planStatus: 'converged' | 'not-converged'; problemHash: string; storedIn: string } | null;
  error: { name: string; field?: string; message: string } | null;
  cancelRequested: boolean;
}

export type PlanState = 'proposed' | 'approved' | 'rejected' | 'superseded';

/** GET /v1/plans summary (api/schemas.ts planSummarySchema). */
export interface PlanSummary {
  planId: string; jobId: string; spacecraftName: string; state: PlanState; converged: boolean; crossCheckPassed: boolean;
  caveatCodes: string[]; submittedBy: string; proposedAt: string;
}

/** The archive's plan record (api/review/review-schemas.ts planRecordSchema). */
export interface PlanRecord extends PlanSummary {
  targetSetKey: string; problemHash: string; softwareVersion: string; proposedSequence: number;
  decidedAt: string | null; decidedBy: string | null; supersededBy: string | null; lastSequence: number;
}

export interface HistoryEntry {
  sequence: number; at: string; actor: string; kind: string; planId: string | null; jobId: string | null;
  payload: Record<string, unknown>; previousHash: string; hash: string; hashMatches: boolean;
}

export const FINAL_JOB_STATES: ReadonlySet<string> = new Set(['completed', 'failed', 'cancelled']);

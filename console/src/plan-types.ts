/** The plan and API shapes the console reads: all from the contract room (the console imports nothing else). */
import type { Identity as TokenIdentity } from '../../contract/index.ts';

export type {
  ManeuverPlan, PlannedBurn, PlannedFiniteBurn, TargetResult, Caveat, PlanBPlane, BPlaneEllipse, TrajectoryPoint, PlanEpoch, CrossCheck,
  Role, JobProgress, JobStatus, AnyJobStatus, PlanState, PlanSummary, PlanRecord, HistoryEntryView as HistoryEntry,
} from '../../contract/index.ts';
export { FINAL_JOB_STATES } from '../../contract/index.ts';

/** Who is signed in, as GET /console/session answers (the token id stays on the server). */
export type Identity = Pick<TokenIdentity, 'name' | 'roles'>;

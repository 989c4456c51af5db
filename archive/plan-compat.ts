/**
 * Compile-time check that the planner's ManeuverPlan can be archived as an ArchivablePlan. The archive
 * imports only the plan's types from planner/ (erased at run time).
 */
import type { ManeuverPlan } from '../planner/index.ts';
import type { ArchivablePlan } from '../contract/archive-types.ts';

/** Resolves to `true` only while ManeuverPlan stays assignable to ArchivablePlan. */
export type ManeuverPlanIsArchivable = ManeuverPlan extends ArchivablePlan ? true : never;
const check: ManeuverPlanIsArchivable = true;
void check;

/** Public face of planner/: other rooms import from here only. */
export { problemSchema, epochTextSchema, REFERENCE_PLANES } from '../contract/problem-schema.ts';
export type {
  PlanningProblem, PlanningProblemInput, ProblemBurn, ProblemTarget, TargetKind, ExecutionErrors, ReferencePlane,
} from '../contract/problem-schema.ts';
export { parseProblem, checkParsedProblem, checkProblem, checksOf, problemEpochs } from './problem-checks.ts';
export type { CheckedProblem, ProblemChecks, ProblemEpochs } from './problem-checks.ts';
export { canonicalJson } from '../contract/canonical-json.ts';
export { problemHash, targetSetKey } from './problem-hash.ts';
export { planLeapSeconds, leapSecondTableOfPlan } from '../propagator/index.ts';
export { leapSecondsFromFileBytes } from './leap-seconds-file.ts';
export { ephemerisWithFiles, type EphemerisFileTable } from './ephemeris-files.ts';
export { CAVEAT_CODES, REVIEW_TEXT, caveat, reviewCaveat, orderCaveats } from './caveats.ts';
export type { CaveatCode } from './caveats.ts';
export type * from '../contract/plan-types.ts';
export { planManeuvers } from './plan/plan-maneuvers.ts';
export { ephemerisNeeds } from './plan/planning-context.ts';
export type { PlanOptions } from './plan/plan-maneuvers.ts';
export { runDispersionSamples, prepareDispersionSamples, summariseDispersion, attachMonteCarlo } from './plan/monte-carlo.ts';
export type { SampleRunOptions } from './plan/monte-carlo.ts';
export type { SampleRangeRunner } from './plan/shared-samples.ts';
export { sampleBatches } from './dispersion/sample-statistics.ts';
export { SOFTWARE_VERSION } from '../contract/software-version.ts';
/** The process-wide ephemeris cache the owner of a planning process passes in PlanOptions.ephemerisCache. */
export { EphemerisCache } from '../propagator/index.ts';
export { solveLambert, LAMBERT_DEFAULTS } from './lambert/index.ts';
export type { LambertDirection, LambertOptions, LambertSolution } from './lambert/index.ts';
export {
  propellantMassKg, deltaVFromPropellantKmS, massFlowRateKgS, burnDurationS, budgetBurns, exhaustVelocityKmS,
  deltaVToInertialKmS, deltaVFromInertialKmS, deltaVInAllAxes,
} from './maneuver-math.ts';
export type { BurnBudget, BurnAxes } from './maneuver-math.ts';
export { budgetRequestSchema, BUDGET_DEFAULTS } from '../contract/budget-schema.ts';
export type { BudgetRequest, BudgetRequestInput } from '../contract/budget-schema.ts';
export {
  parseBudgetRequest, prepareBudget, runBudgetSamples, assembleBudget, runBudget, budgetRequestHash, percentile, percentileInterval, distribution,
} from './budget/index.ts';
export type * from './budget/index.ts';

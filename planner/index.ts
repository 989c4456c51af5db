/** Public face of planner/: other rooms import from here only. */
export { problemSchema, epochTextSchema, REFERENCE_PLANES } from './problem-schema.ts';
export type {
  PlanningProblem, PlanningProblemInput, ProblemBurn, ProblemTarget, TargetKind, ExecutionErrors, ReferencePlane,
} from './problem-schema.ts';
export { parseProblem, checkProblem, problemEpochs } from './problem-checks.ts';
export type { ProblemEpochs } from './problem-checks.ts';
export { canonicalJson, problemHash, targetSetKey } from './problem-hash.ts';
export { CAVEAT_CODES, REVIEW_TEXT, caveat, reviewCaveat, orderCaveats } from './caveats.ts';
export type { CaveatCode } from './caveats.ts';
export type * from './plan-types.ts';

/** Lambert solver (Izzo 2015; single and multiple revolutions). Re-exported by planner/index.ts. */
export { solveLambert } from './izzo-lambert.ts';
export { LAMBERT_DEFAULTS } from './lambert-types.ts';
export type { LambertDirection, LambertOptions, LambertSolution } from './lambert-types.ts';

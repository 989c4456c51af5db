/** The statistical Δv budget of a correction sequence: nominal model, linear and non-linear samples,
 * statistics, agreement. */
export { parseBudgetRequest, type CheckedBudgetRequest } from './budget-checks.ts';
export { prepareBudget, runBudgetSamples, assembleBudget, runBudget, budgetRequestHash } from './run-budget.ts';
export type { BudgetRunOptions, BudgetSampleOptions } from './run-budget.ts';
export { percentile, percentileInterval, distribution } from './budget-statistics.ts';
export type * from '../../contract/budget-types.ts';

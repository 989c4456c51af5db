/**
 * parseBudgetRequest: the budget request's zod shape, then the problem's own checks, then what relates
 * the budget's fields to the problem (one knowledge covariance per burn, each a covariance).
 * Every failure is an InvalidInputError naming the dotted path of the first bad field.
 */
import { BUILTIN_LEAP_SECONDS, InvalidInputError, type LeapSecondTable } from '../../propagator/index.ts';
import { budgetRequestSchema } from '../../contract/budget-schema.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import { choleskySemidefinite, requireCovariance } from '../../propagator/index.ts';
import { checkParsedProblem, fromZodError, type CheckedProblem } from '../problem-checks.ts';

/** A budget request that passed parseBudgetRequest: its problem checked (CheckedProblem, never re-checked). */
export type CheckedBudgetRequest = BudgetRequest & { problem: CheckedProblem };

/** Validates anything from outside as a budget request (UTC epochs through `leapSeconds`); returns it with
 * defaults filled in and its problem checked. */
export function parseBudgetRequest(input: unknown, leapSeconds: LeapSecondTable = BUILTIN_LEAP_SECONDS): CheckedBudgetRequest {
  const parsed = budgetRequestSchema.safeParse(input);
  if (!parsed.success) {
    const e = fromZodError(parsed.error);
    throw e;
  }
  let problem: CheckedProblem;
  try {
    problem = checkParsedProblem(parsed.data.problem, leapSeconds);
  } catch (error) {
    if (error instanceof InvalidInputError) throw new InvalidInputError(`problem.${error.field}`, error.detail, error.code);
    throw error;
  }
  const request: CheckedBudgetRequest = { ...parsed.data, problem };
  const burns = request.problem.burns.length;
  if (request.knowledge.length !== burns) {
    throw new InvalidInputError('knowledge', `needs one entry per burn: ${burns} burns, ${request.knowledge.length} entries`);
  }
  request.knowledge.forEach((k, i) => {
    const field = `knowledge[${i}].covarianceKmKmS`;
    requireCovariance(field, k.covarianceKmKmS, 6);
    choleskySemidefinite(k.covarianceKmKmS, field);
  });
  const initial = request.problem.initialState.covarianceKmKmS;
  if (initial) choleskySemidefinite(initial, 'problem.initialState.covarianceKmKmS');
  if (request.linearSamples === 0 && request.nonlinearSamples === 0) {
    throw new InvalidInputError('linearSamples', 'linearSamples and nonlinearSamples are both 0: nothing to run');
  }
  return request;
}

/**
 * The semantic checks of a submitted problem (epochs in order, bodies modelled, ...), run at submission so
 * the caller hears about them at once (HTTP 400 with the field) instead of from a failed job.
 */
import { checkProblem, parseBudgetRequest, type PlanningProblem } from '../../planner/index.ts';
import type { LeapSecondTable } from '../../propagator/index.ts';

/** A semantic problem with a submitted problem: `field` is the dotted path inside the problem. */
export interface ProblemIssue { field: string; message: string }

/** Returns the first semantic issue of a schema-valid problem, or null when it passes; UTC epochs are read
 * through `leapSeconds` (the table the job will carry to the worker). */
export function findProblemIssue(problem: PlanningProblem, leapSeconds: LeapSecondTable): ProblemIssue | null {
  try {
    checkProblem(problem, leapSeconds);
    return null;
  } catch (error) {
    return issueOf(error);
  }
}

/**
 * The budget request's relation checks (its problem, one knowledge covariance per burn, each a covariance),
 * after the zod shape check at the door; the first problem with its dotted field path (under `request.`),
 * or null.
 */
export function findBudgetIssue(request: unknown, leapSeconds: LeapSecondTable): ProblemIssue | null {
  try {
    parseBudgetRequest(request, leapSeconds);
    return null;
  } catch (error) {
    return issueOf(error);
  }
}

/** An input error as an issue (field, message without the field prefix); any other error is rethrown. */
function issueOf(error: unknown): ProblemIssue {
  const e = error as Error & { field?: unknown };
  if (e.name === 'InvalidInputError' || e.name === 'OutOfSpanError') {
    const field = typeof e.field === 'string' ? e.field : '';
    const prefix = `${field}: `;
    return { field, message: e.message.startsWith(prefix) ? e.message.slice(prefix.length) : e.message };
  }
  throw error;
}

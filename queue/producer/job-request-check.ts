/**
 * The semantic checks of a submitted problem (epochs in order, bodies modelled, ...), run at submission so
 * the caller hears about them at once (HTTP 400 with the field) instead of from a failed job.
 */
import { checkProblem, parseBudgetRequest, type PlanningProblem } from '../../planner/index.ts';
import type { LeapSecondTable } from '../../propagator/index.ts';
import { failureOf } from '../../contract/errors.ts';

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

/** An input error as an issue (its field and message, as data); any other error is rethrown. */
function issueOf(error: unknown): ProblemIssue {
  if (error instanceof Error && (error.name === 'InvalidInputError' || error.name === 'OutOfSpanError')) {
    const { field, message } = failureOf(error);
    return { field: field ?? '', message };
  }
  throw error;
}

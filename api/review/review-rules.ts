/**
 * The review rules, checked inside the archive's write transaction (as its ReviewGuard), against the plan
 * as it stands under the lock:
 *  - a decision is final (the archive itself refuses a second one: 409);
 *  - a rejection needs a comment;
 *  - two-person rule: whoever submitted the job cannot approve its plan;
 *  - a plan that did not converge, or whose independent cross-check failed, can never be approved;
 *  - approval acknowledges every caveat of the plan by its code, and only those codes.
 */
import type { PlanRecord, RecordReviewInput, ReviewGuard } from '../../archive/index.ts';
import { sameIdentityName } from '../auth/index.ts';
import { hasVisibleText } from '../../contract/free-text.ts';

/** A review refused by a rule; `status` is the HTTP answer, `details` lists what was wrong. */
export class ReviewRuleError extends Error {
  override readonly name = 'ReviewRuleError';
  constructor(
    readonly status: 400 | 403 | 422,
    readonly code: 'COMMENT_REQUIRED' | 'TWO_PERSON_RULE' | 'PLAN_NOT_APPROVABLE' | 'CAVEATS_NOT_ACKNOWLEDGED',
    message: string,
    readonly details: { missing?: string[]; unknown?: string[] } = {},
  ) {
    super(message);
  }
}

/** Which of the plan's caveat codes are missing from the acknowledgement, and which acknowledged codes it does not have. */
export function caveatAcknowledgement(planCodes: readonly string[], acknowledged: readonly string[]): { missing: string[]; unknown: string[] } {
  const have = new Set(planCodes);
  const given = new Set(acknowledged);
  return { missing: [...have].filter((c) => !given.has(c)), unknown: [...given].filter((c) => !have.has(c)) };
}

/** Throws ReviewRuleError when `input` breaks a rule for `plan`; returns quietly otherwise. */
export function checkReviewRules(plan: PlanRecord, input: RecordReviewInput): void {
  if (input.decision === 'reject') {
    if (!hasVisibleText(input.comment)) throw new ReviewRuleError(400, 'COMMENT_REQUIRED', 'a rejection needs a comment saying why (visible characters)');
    return;
  }
  // Case-insensitive: tokens made before names were lowercased may differ from the submitter only in case.
  if (sameIdentityName(input.reviewer, plan.submittedBy)) {
    throw new ReviewRuleError(403, 'TWO_PERSON_RULE',
      `${input.reviewer} submitted the job of plan ${plan.planId}; another reviewer must approve it`);
  }
  if (!plan.converged) {
    throw new ReviewRuleError(422, 'PLAN_NOT_APPROVABLE', `plan ${plan.planId} did not converge; it can never be approved (reject it or submit a new job)`);
  }
  if (!plan.crossCheckPassed) {
    throw new ReviewRuleError(422, 'PLAN_NOT_APPROVABLE',
      `plan ${plan.planId} failed its independent cross-check; it can never be approved (reject it or submit a new job)`);
  }
  const { missing, unknown } = caveatAcknowledgement(plan.caveatCodes, input.acknowledgedCaveatCodes);
  if (missing.length > 0 || unknown.length > 0) {
    const parts = [missing.length ? `not acknowledged: ${missing.join(', ')}` : '', unknown.length ? `not caveats of this plan: ${unknown.join(', ')}` : '']
      .filter(Boolean).join('; ');
    throw new ReviewRuleError(422, 'CAVEATS_NOT_ACKNOWLEDGED', `approval must acknowledge every caveat of the plan by its code — ${parts}`, { missing, unknown });
  }
}

/** The rules as the archive's guard. */
export const reviewGuard: ReviewGuard = checkReviewRules;

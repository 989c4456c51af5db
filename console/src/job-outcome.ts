/**
 * How a finished job's outcome is worded. Only a converged result whose independent cross-check passed is a
 * plan to review; a result that did not converge, or whose cross-check failed, is diagnostics and is never
 * presented as a plan awaiting approval (project safety rule).
 */

export interface JobOutcomeText {
  /** Short line under the progress bar. */
  stage: string;
  /** The explanation shown in the outcome box. */
  message: string;
  /** True for the two diagnostics-only outcomes (shown as a warning). */
  warning: boolean;
  /** Text of the link to the archived record. */
  linkText: string;
}

/**
 * Words the outcome of a completed job. `crossCheckPassed` is null while it is not yet known (the job status
 * does not carry it; the plan record does).
 */
export function jobOutcomeText(planStatus: 'converged' | 'not-converged', crossCheckPassed: boolean | null): JobOutcomeText {
  if (planStatus !== 'converged') {
    return { stage: 'Finished: no plan — the corrector did not converge.', warning: true, linkText: 'Open the diagnostics',
      message: 'No plan: the corrector did not converge; diagnostics only. This result can never be approved.' };
  }
  if (crossCheckPassed === false) {
    return { stage: 'Finished: no plan — the cross-check failed.', warning: true, linkText: 'Open the diagnostics',
      message: 'No plan: the corrector converged but the independent cross-check failed its tolerance; diagnostics only. This result can never be approved.' };
  }
  if (crossCheckPassed === null) {
    return { stage: 'Finished: checking the cross-check result…', warning: false, linkText: 'Open the result',
      message: 'The corrector converged. Its cross-check result is not known yet: open the result and read the cross-check before treating it as a plan to review.' };
  }
  return { stage: 'Done: a proposed plan is ready for review.', warning: false, linkText: 'Open the proposed plan',
    message: 'The corrector converged and the cross-check passed. The plan is a proposal requiring review and approval by qualified '
      + 'flight-dynamics staff: open it to review the burns, plots, cross-check and caveats.' };
}

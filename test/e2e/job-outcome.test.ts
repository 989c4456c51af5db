/**
 * Wording of a finished job in the console (console/src/job-outcome.ts). Project safety rule: never present an
 * unconverged or unchecked result as a plan; only converged + cross-check passed is a plan to review.
 */
import { describe, expect, it } from 'vitest';
import { jobOutcomeText } from '../../console/src/job-outcome.ts';

describe('job outcome wording', () => {
  describe('when the corrector did not converge', () => {
    it('should say there is no plan, only diagnostics', () => {
      const text = jobOutcomeText('not-converged', null);
      expect(text.message).toContain('No plan: the corrector did not converge; diagnostics only');
      expect(`${text.stage} ${text.message} ${text.linkText}`).not.toMatch(/ready for review|proposed plan/i);
      expect(text.warning).toBe(true);
    });
  });

  describe('when the cross-check failed', () => {
    it('should say so and not offer a plan for review', () => {
      const text = jobOutcomeText('converged', false);
      expect(text.message).toContain('cross-check failed its tolerance; diagnostics only');
      expect(`${text.stage} ${text.message} ${text.linkText}`).not.toMatch(/ready for review|proposed plan/i);
    });
  });

  describe('when the cross-check result is not known yet', () => {
    it('should not call it a plan ready for review', () => {
      const text = jobOutcomeText('converged', null);
      expect(`${text.stage} ${text.message} ${text.linkText}`).not.toMatch(/ready for review|proposed plan/i);
    });
  });

  describe('when converged and cross-checked', () => {
    it('should offer the proposed plan for review by qualified staff', () => {
      const text = jobOutcomeText('converged', true);
      expect(text.stage).toBe('Done: a proposed plan is ready for review.');
      expect(text.message).toContain('requiring review and approval by qualified flight-dynamics staff');
      expect(text.linkText).toBe('Open the proposed plan');
    });
  });
});

/**
 * The caveat catalogue: stable codes (the archive, the console and reviewers key on them), a severity and
 * a plain-text message built from the numbers that triggered it. `PROPOSAL_REQUIRES_REVIEW` is on every plan.
 */
import type { Caveat, CaveatSeverity } from '../contract/plan-types.ts';

export const CAVEAT_CODES = [
  'PROPOSAL_REQUIRES_REVIEW',
  'NOT_CONVERGED',
  'CROSS_CHECK_FAILED',
  'IMPULSIVE_APPROXIMATION_QUESTIONABLE',
  'CLOSEST_APPROACH_BELOW_SAFE_ALTITUDE',
  'IMPACT_PROBABILITY_ABOVE_LIMIT',
  'JACOBIAN_ILL_CONDITIONED',
  'BUILTIN_EPHEMERIS_ACCURACY',
  'NO_INITIAL_STATE_COVARIANCE',
  'TARGETS_MET_IN_LEAST_SQUARES_ONLY',
  'DISPERSION_LINEARITY_CHECK_FAILED',
  'NO_EXECUTION_ERROR_MODEL',
  'MONTE_CARLO_NOT_RUN',
  'UTC_BEYOND_LEAP_SECOND_TABLE',
  'BUDGET_IS_A_STUDY',
  'BUDGET_REPLAN_NOT_CONVERGED',
  'BUDGET_PATHS_DISAGREE',
  'BUDGET_LIMIT_CROSSING',
  'UTC_LEAP_SECONDS_ASSUMED',
  'FINITE_BURN_OVERLAPS_EVENT',
  'PROPELLANT_EXCEEDS_LOAD',
] as const;
export type CaveatCode = (typeof CAVEAT_CODES)[number];

/** Text of the caveat every plan carries. */
export const REVIEW_TEXT = 'Proposed plan — requires review and approval by qualified flight-dynamics staff and '
  + 'independent verification before any commanding; follow the mission\'s own procedures.';

const SEVERITY: Readonly<Record<CaveatCode, CaveatSeverity>> = Object.freeze({
  PROPOSAL_REQUIRES_REVIEW: 'critical',
  NOT_CONVERGED: 'critical',
  CROSS_CHECK_FAILED: 'critical',
  IMPULSIVE_APPROXIMATION_QUESTIONABLE: 'warning',
  CLOSEST_APPROACH_BELOW_SAFE_ALTITUDE: 'critical',
  IMPACT_PROBABILITY_ABOVE_LIMIT: 'critical',
  JACOBIAN_ILL_CONDITIONED: 'warning',
  BUILTIN_EPHEMERIS_ACCURACY: 'warning',
  NO_INITIAL_STATE_COVARIANCE: 'info',
  TARGETS_MET_IN_LEAST_SQUARES_ONLY: 'warning',
  DISPERSION_LINEARITY_CHECK_FAILED: 'warning',
  NO_EXECUTION_ERROR_MODEL: 'info',
  MONTE_CARLO_NOT_RUN: 'info',
  UTC_BEYOND_LEAP_SECOND_TABLE: 'info',
  BUDGET_IS_A_STUDY: 'warning',
  BUDGET_REPLAN_NOT_CONVERGED: 'warning',
  BUDGET_PATHS_DISAGREE: 'warning',
  BUDGET_LIMIT_CROSSING: 'critical',
  UTC_LEAP_SECONDS_ASSUMED: 'warning',
  FINITE_BURN_OVERLAPS_EVENT: 'critical',
  PROPELLANT_EXCEEDS_LOAD: 'critical',
});

/** Builds one caveat with its catalogue severity. */
export function caveat(code: CaveatCode, text: string): Caveat {
  return { code, severity: SEVERITY[code], text };
}

/** The caveat every plan carries. */
export function reviewCaveat(): Caveat {
  return caveat('PROPOSAL_REQUIRES_REVIEW', REVIEW_TEXT);
}

const ORDER: Readonly<Record<CaveatSeverity, number>> = { critical: 0, warning: 1, info: 2 };

/** Sorts caveats critical first (stable), the review caveat always first, one per code. */
export function orderCaveats(caveats: readonly Caveat[]): Caveat[] {
  const seen = new Set<string>();
  const unique = caveats.filter((c) => (seen.has(c.code) ? false : (seen.add(c.code), true)));
  if (!seen.has('PROPOSAL_REQUIRES_REVIEW')) unique.unshift(reviewCaveat());
  return unique
    .map((c, i) => ({ c, i }))
    .sort((a, b) => {
      if (a.c.code === 'PROPOSAL_REQUIRES_REVIEW') return -1;
      if (b.c.code === 'PROPOSAL_REQUIRES_REVIEW') return 1;
      return ORDER[a.c.severity] - ORDER[b.c.severity] || a.i - b.i;
    })
    .map(({ c }) => c);
}

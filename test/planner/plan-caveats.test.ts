import { beforeAll, describe, expect, it } from 'vitest';
import { attachMonteCarlo, parseProblem, planManeuvers } from '../../planner/index.ts';
import type { ManeuverPlan, MonteCarloSummary } from '../../planner/index.ts';
import { planCaveats } from '../../planner/plan/plan-caveats.ts';
import { twoBodyProblem } from './two-body-fixture.ts';

let plan: ManeuverPlan;
beforeAll(async () => {
  plan = await planManeuvers(parseProblem(twoBodyProblem({ dispersion: { samples: 0, seed: 1 } })));
});

const codes = (p: ManeuverPlan): string[] => planCaveats(p).map((c) => c.code);

function summary(overrides: Partial<MonteCarloSummary>): MonteCarloSummary {
  return {
    samples: 100, seed: 1, bPlane: null, meanBDotTKm: null, meanBDotRKm: null, closestApproachSigmaS: null, impacts: 0,
    impactProbability: 0, impactProbabilityInterval: { lower95: 0, upper95: 0.03 }, linearAgreement: null, targetSigmas: [],
    bPlanePoints: [], failedSamples: 0, ...overrides,
  };
}

describe('plan caveats', () => {
  describe('when the plan is converged and clean', () => {
    it('should always lead with the review caveat and note what is missing', () => {
      const c = planCaveats(plan);
      expect(c[0].code).toBe('PROPOSAL_REQUIRES_REVIEW');
      expect(c[0].text).toContain('qualified flight-dynamics staff');
      expect(codes(plan)).toContain('NO_INITIAL_STATE_COVARIANCE');
      expect(codes(plan)).not.toContain('CLOSEST_APPROACH_BELOW_SAFE_ALTITUDE');
    });
  });

  describe('when a threshold is crossed', () => {
    it('should flag a long burn against the time to its target', () => {
      const long = { ...plan, burns: plan.burns.map((b) => ({ ...b, durationS: 0.5 * (b.timeToTargetS ?? 0) })) };
      expect(codes(long)).toContain('IMPULSIVE_APPROXIMATION_QUESTIONABLE');
    });
    it('should flag a closest approach below the safe altitude', () => {
      const low = { ...plan, approaches: [{ body: 'mars' as const, epoch: plan.createdFrom.endEpoch, distanceKm: 3500, altitudeKm: 104 }] };
      expect(planCaveats(low).find((c) => c.code === 'CLOSEST_APPROACH_BELOW_SAFE_ALTITUDE')?.severity).toBe('critical');
    });
    it('should flag an ill-conditioned Jacobian and a failed cross-check', () => {
      const bad = {
        ...plan,
        convergence: { ...plan.convergence, maxConditionNumber: 1e12 },
        crossCheck: { ...plan.crossCheck, passed: false, message: 'B·T differs by 3 km' },
      };
      expect(codes(bad)).toEqual(expect.arrayContaining(['JACOBIAN_ILL_CONDITIONED', 'CROSS_CHECK_FAILED']));
    });
  });

  describe('when Monte Carlo results are attached', () => {
    it('should raise the impact and linearity caveats from the samples', () => {
      const attached = attachMonteCarlo(plan, summary({
        impacts: 3, impactProbability: 0.03, impactProbabilityInterval: { lower95: 0.006, upper95: 0.085 },
        linearAgreement: { axisRatioError: 0.6, orientationErrorDeg: 20, passed: false, limit: 1e-3, meanPValue: 1e-9, covariancePValue: 1e-7, message: 'sample spread 1.6× the linear one' },
      }));
      expect(attached.caveats.map((c) => c.code)).toEqual(expect.arrayContaining(['IMPACT_PROBABILITY_ABOVE_LIMIT', 'DISPERSION_LINEARITY_CHECK_FAILED']));
      expect(attached.caveats.map((c) => c.code)).not.toContain('MONTE_CARLO_NOT_RUN');
    });
    it('should note that no linearity check ran when the plan has no B-plane target', () => {
      const attached = attachMonteCarlo(plan, summary({}));
      const notes = attached.dispersion.notes.filter((n) => n.startsWith('no linearity check'));
      expect(notes).toHaveLength(1);
      expect(notes[0]).toContain('B-plane target only');
      // Attaching again (a later fan-out) keeps one such note.
      expect(attachMonteCarlo(attached, summary({})).dispersion.notes.filter((n) => n.startsWith('no linearity check'))).toHaveLength(1);
    });
    it('should drop the not-run note once samples exist', () => {
      expect(codes(plan)).toContain('MONTE_CARLO_NOT_RUN');
      expect(attachMonteCarlo(plan, summary({})).caveats.map((c) => c.code)).not.toContain('MONTE_CARLO_NOT_RUN');
    });
  });
});

/**
 * Reference check of the demo flyby plan: after the planned burn, an INDEPENDENT re-propagation
 * (test/reference/independent-flyby.ts: odex + astronomy-engine, sources named there) meets every target
 * within its tolerance, and the STM-chained Jacobian agrees with finite differences.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import type { ManeuverPlan } from '../../planner/index.ts';
import { reflyDemoPlan } from './independent-flyby.ts';

describe('demo flyby retargeting (examples/flyby-demo.json)', () => {
  const json = JSON.parse(readFileSync(new URL('../../examples/flyby-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
  const problem = parseProblem({ ...json, dispersion: { samples: 0, seed: 1 } });
  let plan: ManeuverPlan;

  describe('when the planner solves it', () => {
    it('should converge, pass its cross-check and match STM and finite-difference Jacobians', async () => {
      plan = await planManeuvers(problem, { monteCarlo: 'skip', verifyJacobian: true });
      expect(plan.status).toBe('converged');
      expect(plan.crossCheck.passed).toBe(true);
      expect(plan.targets.every((t) => t.met)).toBe(true);
      // Central differences (1 mm/s steps) against the STM chain, relative to each row's largest entry.
      // Observed 3.4e-5 (2026-12), the same with 0.1, 1 and 10 mm/s steps and at tolerance 1e-12, so it is
      // not step noise: the STM chain leaves out the change of the solar-pressure acceleration through the
      // propellant mass the burn uses (∂m/∂Δv). With solar pressure off it falls to 3.5e-7 at 1 mm/s
      // (3e-6 at 0.1 mm/s: round-off noise; 3e-6 at 10 mm/s: truncation). Limit about 3× the observed value.
      expect(plan.sensitivities?.stmVersusFiniteDifference).toBeLessThan(1e-4);
    });
  });

  describe('when the planned burn is re-propagated independently (odex + astronomy-engine)', () => {
    it('should meet every target within its tolerance', () => {
      const caTarget = problem.targets.find((t) => t.kind === 'closest-approach-epoch');
      const bTarget = problem.targets.find((t) => t.kind === 'b-plane');
      if (!caTarget || caTarget.kind !== 'closest-approach-epoch' || !bTarget || bTarget.kind !== 'b-plane') throw new Error('demo targets changed');
      const tGuess = plan.targets.find((t) => t.kind === 'closest-approach-epoch')?.requested as number;
      const bp = reflyDemoPlan(problem, plan);
      const tb = bp.closestApproachTdbS;
      const achieved = (kind: string, component?: string) => plan.targets.find((t) => t.kind === kind && (component === undefined || t.component.includes(component)))?.achieved as number;
      console.info(`independent re-flight vs requested: B·T ${(bp.bDotTKm - bTarget.bDotTKm).toExponential(2)} km, B·R ${(bp.bDotRKm - bTarget.bDotRKm).toExponential(2)} km, `
        + `approach ${(tb - tGuess).toExponential(2)} s; vs the plan's achieved: B·T ${(bp.bDotTKm - achieved('b-plane', 'T')).toExponential(2)} km, `
        + `B·R ${(bp.bDotRKm - achieved('b-plane', 'R')).toExponential(2)} km, approach ${(tb - achieved('closest-approach-epoch')).toExponential(2)} s`);
      expect(Math.abs(bp.bDotTKm - bTarget.bDotTKm)).toBeLessThan(bTarget.toleranceKm);
      expect(Math.abs(bp.bDotRKm - bTarget.bDotRKm)).toBeLessThan(bTarget.toleranceKm);
      expect(Math.abs(tb - tGuess)).toBeLessThan(caTarget.toleranceS);
      // Agreement of the two propagations (independent re-flight against the plan's own achieved values):
      // measured 0.022 km (B·T), 0.010 km (B·R) and 0.013 s (2026-12-03, printed above on every run); limits
      // about 5x that (the two differ in ephemeris evaluation — cache versus direct — and integrator).
      expect(Math.abs(bp.bDotTKm - achieved('b-plane', 'T'))).toBeLessThan(0.1);
      expect(Math.abs(bp.bDotRKm - achieved('b-plane', 'R'))).toBeLessThan(0.1);
      expect(Math.abs(tb - achieved('closest-approach-epoch'))).toBeLessThan(0.07);
    });
  });
});

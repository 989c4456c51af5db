/**
 * A finite-burn plan in the CCSDS OPM (CCSDS 502.0-B-2, maneuver keywords MAN_EPOCH_IGNITION, MAN_DURATION,
 * MAN_DELTA_MASS, MAN_REF_FRAME, MAN_DV_1..3) and in the text report: the same burn in both, read back
 * from the written message.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { exportPlanAsCcsds, readOpm } from '../../ccsds/index.ts';
import { formatPlanReport } from '../../cli/report/plan-report.ts';
import { parseProblem, planManeuvers, type ManeuverPlan, type CheckedProblem } from '../../planner/index.ts';
import { twoBodyProblem } from '../planner/two-body-fixture.ts';

describe('a finite-burn plan exported', () => {
  let problem: CheckedProblem;
  let plan: ManeuverPlan;
  beforeAll(async () => {
    const base = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
    problem = parseProblem({ ...base, spacecraft: { ...base.spacecraft, engine: { ispS: 220, thrustN: 8 } }, burns: [{ ...base.burns[0], model: 'finite' }] });
    plan = await planManeuvers(problem, { monteCarlo: 'skip' });
  }, 120_000);

  describe('when written as an OPM', () => {
    it('should give the ignition epoch, duration, Δmass and the Δv in the stated frame', async () => {
      const f = plan.burns[0].finite!;
      const opm = readOpm(await exportPlanAsCcsds(problem, plan, { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00', timeSystem: 'TDB' }));
      const m = opm.maneuvers[0];
      expect(m.epochIgnitionTdbS).toBeCloseTo(f.startTdbS, 5);
      expect(m.durationS).toBeCloseTo(f.durationS, 3); // the writer gives MAN_DURATION to the millisecond
      expect(m.deltaMassKg).toBeCloseTo(-f.propellantKg, 6);
      expect(m.manRefFrame).toBe('RTN');
      expect(Math.hypot(...m.deltaVKmS) * 1000).toBeCloseTo(f.idealDeltaVMS, 6);
      expect(m.comments.join(' ')).toContain('finite burn as planned');
    });
  });

  describe('when printed as the text report', () => {
    it('should show the finite burn with its ignition, cut-off, masses and loss', () => {
      const text = formatPlanReport(plan);
      const f = plan.burns[0].finite!;
      expect(text).toContain(`duration ${f.durationS.toFixed(3)} s`);
      expect(text).toContain(`finite-burn loss ${f.finiteBurnLossMS.toFixed(4)} m/s`);
      expect(text).toContain(f.start.tdb);
      expect(text).not.toContain('Proposed burns (impulsive');
    });
  });
});

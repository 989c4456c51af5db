/**
 * Retargeting a Mars flyby with a low-thrust finite burn, re-flown INDEPENDENTLY (test/reference/
 * independent-flyby.ts: odex + astronomy-engine, sources named there) from the plan JSON alone plus the
 * problem's initial state. Invented situation: the demo probe (examples/flyby-demo.json) two days before
 * its Mars encounter, on the demo's cruise after its TCM-1 (state below, coasted there by the project's
 * propagator and written down once), moves its B-plane aim point by 250 km with an 8 N engine (Isp 224 s)
 * an hour and a quarter before closest approach: a burn of about 67 minutes that ends ~40 minutes before
 * the approach, where Mars's gravity turns the trajectory during the burn (gravity loss, common practice).
 * Tolerances 0.1 km (B-plane) and 0.1 s (approach epoch) are the test's own choice.
 *
 * Measured (2026-12-03, printed on every run), re-flight minus requested (finite burn 4042 s, ideal Δv
 * 53.63 m/s against 53.28 m/s impulsive: finite-burn loss 0.35 m/s):
 *   finite plan                               B·T 1.6e-2 km, B·R 1.3e-2 km, approach 1.2e-2 s (met)
 *   impulsive plan flown impulsively          B·T 2.3e-2 km, B·R 1.0e-2 km, approach 1.3e-2 s (met)
 *   impulsive plan flown as a centred burn    B·T −0.81 km,  B·R 0.39 km,   approach 0.21 s (missed)
 * The ~0.02 km / 0.013 s left in every re-flight is the two propagations' disagreement (the demo flyby's
 * reference test sees the same: cached versus direct ephemeris, and the integrators). The same plans
 * dispersed with Gates execution errors: Monte Carlo against linear σ at the end of the file.
 */
import { readFileSync } from 'node:fs';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import type { CheckedProblem, ManeuverPlan, PlanningProblem } from '../../planner/index.ts';
import { reflyDemoPlan, type FlownBurn } from './independent-flyby.ts';

const demo = JSON.parse(readFileSync(new URL('../../examples/flyby-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
const ENGINE = { ispS: 224, thrustN: 8 };
const TOLERANCE = { km: 0.1, s: 0.1 };
const REQUESTED = { bDotTKm: 7878, bDotRKm: -2901.4, epoch: '2031-10-11T12:00:00 TDB' };

/** The problem with the burn `model`; with `executionOnly`, 300 Monte Carlo samples (seed 13) and no
 * orbit-determination covariance, so only the execution errors disperse it. */
function problemWith(model: 'impulsive' | 'finite', executionOnly = false): CheckedProblem {
  const { covarianceKmKmS, ...demoState } = demo.initialState as { covarianceKmKmS: number[][] };
  return parseProblem({
    ...demo,
    title: 'Saltmarsh (invented probe): late approach retargeting of the Mars flyby with a low-thrust engine',
    spacecraft: { ...(demo.spacecraft as object), massKg: 610.394, engine: ENGINE },
    initialState: {
      ...demoState, ...(executionOnly ? {} : { covarianceKmKmS }), epoch: '2031-10-09T12:00:00 TDB',
      positionKm: [140417361.29251075, -138418309.4566489, -67087400.595283836],
      velocityKmS: [15.967041024311378, 15.537572657901391, 5.644360155506279],
    },
    burns: [{ label: 'TCM-A', epoch: '2031-10-11T10:45:00 TDB', frame: 'inertial', deltaVGuessKmS: [0, 0, 0], model }],
    targets: [
      { kind: 'b-plane', body: 'mars', referencePlane: 'ecliptic', bDotTKm: REQUESTED.bDotTKm, bDotRKm: REQUESTED.bDotRKm, toleranceKm: TOLERANCE.km },
      { kind: 'closest-approach-epoch', body: 'mars', epoch: REQUESTED.epoch, toleranceS: TOLERANCE.s },
    ],
    dispersion: executionOnly ? { samples: 300, seed: 13 } : { samples: 0, seed: 1 },
  });
}

describe('retargeting a Mars flyby with a low-thrust finite burn', () => {
  const finiteProblem = problemWith('finite');
  const impulsiveProblem = problemWith('impulsive');
  let finitePlan: ManeuverPlan;
  let impulsivePlan: ManeuverPlan;
  beforeAll(async () => {
    finitePlan = await planManeuvers(finiteProblem, { monteCarlo: 'skip' });
    impulsivePlan = await planManeuvers(impulsiveProblem, { monteCarlo: 'skip' });
  }, 120_000);

  /** Re-flight minus requested: B·T, B·R (km), approach (s); printed with `label`. */
  function miss(label: string, plan: ManeuverPlan, problem: PlanningProblem, burn?: FlownBurn): number[] {
    const r = reflyDemoPlan(problem, plan, [0, 0, 0], burn);
    const requestedS = plan.targets.find((t) => t.kind === 'closest-approach-epoch')?.requested as number;
    const m = [r.bDotTKm - REQUESTED.bDotTKm, r.bDotRKm - REQUESTED.bDotRKm, r.closestApproachTdbS - requestedS];
    console.info(`${label}, independent re-flight minus requested: B·T ${m[0].toExponential(2)} km, B·R ${m[1].toExponential(2)} km, approach ${m[2].toExponential(2)} s`);
    return m;
  }

  describe('when the planner solves for the finite burn', () => {
    it('should converge, cross-checked, to a burn of tens of minutes with a positive finite-burn loss', () => {
      expect(finitePlan.status).toBe('converged');
      expect(finitePlan.crossCheck.passed).toBe(true);
      // The check varies the formulation on the arc too (Encke there, Cowell in the plan).
      expect(finitePlan.crossCheck.message).toMatch(/finite-burn arcs: Encke form in the check, Cowell form in the plan/);
      expect(finitePlan.targets.every((t) => t.met)).toBe(true);
      const f = finitePlan.burns[0].finite!;
      console.info(`finite burn ${f.durationS.toFixed(0)} s, ideal Δv ${f.idealDeltaVMS.toFixed(3)} m/s, impulsive ${f.impulsiveDeltaVMS.toFixed(3)} m/s, loss ${f.finiteBurnLossMS.toExponential(2)} m/s`);
      expect(f.durationS).toBeGreaterThan(20 * 60);
      expect(f.durationS).toBeLessThan(90 * 60);
      // Measured loss 0.35 m/s on 53.3 m/s: the finite burn costs more than the impulsive one (common practice).
      expect(f.finiteBurnLossMS).toBeGreaterThan(0);
      // The burn ends before the approach: no event inside the arc.
      expect(f.insideArc).toEqual([]);
    });
  });

  describe('when each plan is re-flown by the independent integrator', () => {
    it('should meet every target with the finite plan read from its JSON alone', () => {
      const json = JSON.parse(JSON.stringify(finitePlan)) as ManeuverPlan;
      const m = miss('finite plan', json, finiteProblem);
      expect(Math.abs(m[0])).toBeLessThan(TOLERANCE.km);
      expect(Math.abs(m[1])).toBeLessThan(TOLERANCE.km);
      expect(Math.abs(m[2])).toBeLessThan(TOLERANCE.s);
      // Against the plan's own achieved values: measured 0.023 km, 0.010 km, 0.013 s; limits 4-5x above (the
      // same two propagations as flyby-targeting.test.ts, which sees the same disagreement).
      const achieved = json.targets.map((t, i) => (t.achieved as number) - (t.requested as number) - m[i]);
      console.info(`finite plan, plan's achieved minus re-flight: ${achieved.map((x) => x.toExponential(2)).join(', ')}`);
      expect(Math.abs(achieved[0])).toBeLessThan(0.1);
      expect(Math.abs(achieved[1])).toBeLessThan(0.05);
      expect(Math.abs(achieved[2])).toBeLessThan(0.07);
    });

    it('should meet every target with the impulsive plan flown impulsively (the re-flight itself is sound)', () => {
      const m = miss('impulsive plan, impulsive', impulsivePlan, impulsiveProblem);
      expect(impulsivePlan.status).toBe('converged');
      expect(Math.abs(m[0])).toBeLessThan(TOLERANCE.km);
      expect(Math.abs(m[1])).toBeLessThan(TOLERANCE.km);
      expect(Math.abs(m[2])).toBeLessThan(TOLERANCE.s);
    });

    it('should miss the B-plane aim by several tolerances with the impulsive plan flown as a centred finite burn', () => {
      const b = impulsivePlan.burns[0];
      const dv = Math.hypot(...b.deltaVInertialKmS);
      const massFlowKgS = finitePlan.burns[0].finite!.massFlowKgS;
      const centred: FlownBurn = {
        model: 'finite', startTdbS: b.epoch.tdbS - b.durationS / 2, durationS: b.durationS, massBeforeKg: b.massBeforeKg,
        thrust: { thrustN: ENGINE.thrustN, massFlowKgS, direction: b.deltaVInertialKmS.map((x) => x / dv) },
      };
      const m = miss('impulsive plan as a centred finite burn', impulsivePlan, impulsiveProblem, centred);
      // Measured |ΔB| 0.90 km against the 0.1 km tolerance (and approach 0.21 s against 0.1 s).
      expect(Math.hypot(m[0], m[1])).toBeGreaterThan(3 * TOLERANCE.km);
    });
  });

  describe('when the plans are dispersed with Gates execution errors alone (no orbit-determination covariance)', () => {
    it('should give Monte Carlo target σ that agree with the linear mapping, as closely as the impulsive plan\'s do', async () => {
      const ratios: number[][] = [];
      for (const model of ['finite', 'impulsive'] as const) {
        const plan = await planManeuvers(problemWith(model, true));
        const mc = plan.dispersion.monteCarlo!;
        expect(mc.samples).toBe(300);
        expect(mc.failedSamples).toBe(0);
        const linear = plan.dispersion.linear!.execution.targetSigmas;
        ratios.push(linear.map((sigma, i) => (mc.targetSigmas[i] as number) / sigma));
      }
      console.info(`Monte Carlo / linear σ (B·T, B·R, approach): finite ${ratios[0].map((r) => r.toFixed(3)).join(', ')}; impulsive ${ratios[1].map((r) => r.toFixed(3)).join(', ')}`);
      // A sample σ has a relative standard error of about 1/√(2(n−1)) = 4.1 % for n = 300 (normal samples);
      // 15 % is ~3.7 standard errors. Measured (seed 13) finite 1.035, 0.897, 1.033; impulsive 1.030, 0.892,
      // 1.025 (the same draws): the −10 % on B·R is this sample's, not the finite mapping's. Paired, the two
      // plans' ratios differ by ≤ 0.008; limit 0.04.
      ratios[0].forEach((r, i) => {
        expect(Math.abs(r - 1)).toBeLessThan(0.15);
        expect(Math.abs(r - ratios[1][i])).toBeLessThan(0.04);
      });
    }, 240_000);
  });
});

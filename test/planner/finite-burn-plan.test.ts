/**
 * Planning finite burns end to end on the two-body fixture with a low-thrust engine (8 N on 500 kg: a
 * burn of about 15 minutes for the fixture's 14 m/s). The finite plan is re-flown from its plan JSON alone
 * (plus the problem's initial state) by odex (npm 2.0.4, Hairer & Wanner's GBS extrapolation code ported
 * to JavaScript; a general-purpose integrator outside the project) with VNB axes and mass built here,
 * and must meet the target; the impulsive plan flown as a burn centred on its epoch must not.
 */
import { createRequire } from 'node:module';
import { beforeAll, describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import type { ManeuverPlan, PlanningProblemInput } from '../../planner/index.ts';
import { GM_KM3_S2, parseEpoch, STANDARD_GRAVITY_M_S2 } from '../../propagator/index.ts';
import type { Vec3 } from '../../propagator/index.ts';
import { twoBodyProblem } from './two-body-fixture.ts';

interface OdexSolver {
  absoluteTolerance: number; relativeTolerance: number; maxSteps: number;
  solve(f: (x: number, y: number[]) => number[], x0: number, y0: number[], x1: number): { y: number[]; outcome: number };
}
// odex ships TypeScript sources that do not compile under our strict settings, so load its JS build.
const odex = createRequire(import.meta.url)('odex') as { Solver: new (n: number) => OdexSolver };

const ENGINE = { ispS: 220, thrustN: 8 };
const cross = (a: number[], b: number[]): number[] => [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]];
const unit = (a: number[]): number[] => a.map((x) => x / Math.hypot(a[0], a[1], a[2]));

interface Flight { startTdbS: number; durationS: number; thrustN: number; massFlowKgS: number; massKg: number; axes: 'inertial' | 'RTN' | 'VNB'; direction: number[] }

/** Two-body + constant thrust along a direction fixed in `axes`, mass integrated; returns [r, v, m] at `endTdbS`. */
function odexFly(problem: PlanningProblemInput, flight: Flight, endTdbS: number): number[] {
  const solver = new odex.Solver(7);
  solver.absoluteTolerance = 1e-13;
  solver.relativeTolerance = 1e-13;
  solver.maxSteps = 200000;
  const mu = GM_KM3_S2.earth;
  const rhs = (on: boolean) => (_t: number, y: number[]): number[] => {
    const d = Math.hypot(y[0], y[1], y[2]);
    const a = [0, 1, 2].map((i) => (-mu / (d * d * d)) * y[i]);
    if (on) {
      let dir = flight.direction;
      if (flight.axes !== 'inertial') {
        const n = unit(cross(y.slice(0, 3), y.slice(3, 6)));
        const first = unit(flight.axes === 'VNB' ? y.slice(3, 6) : y.slice(0, 3));
        const third = flight.axes === 'VNB' ? cross(first, n) : cross(n, first);
        const [e0, e1, e2] = flight.axes === 'VNB' ? [first, n, third] : [first, third, n];
        dir = [0, 1, 2].map((i) => flight.direction[0] * e0[i] + flight.direction[1] * e1[i] + flight.direction[2] * e2[i]);
      }
      for (let i = 0; i < 3; i++) a[i] += (flight.thrustN / 1000 / y[6]) * dir[i];
    }
    return [y[3], y[4], y[5], a[0], a[1], a[2], on ? -flight.massFlowKgS : 0];
  };
  const t0 = parseEpoch(problem.initialState.epoch);
  let y = [...problem.initialState.positionKm, ...problem.initialState.velocityKmS, flight.massKg];
  const legs: [number, number, boolean][] = [[t0, flight.startTdbS, false], [flight.startTdbS, flight.startTdbS + flight.durationS, true], [flight.startTdbS + flight.durationS, endTdbS, false]];
  for (const [from, to, on] of legs) {
    const out = solver.solve(rhs(on), from, y, to);
    expect(out.outcome).toBe(0);
    y = out.y;
  }
  return y;
}

describe('planning finite burns', () => {
  const base = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
  const problem: PlanningProblemInput = {
    ...base, spacecraft: { ...base.spacecraft, engine: ENGINE }, burns: [{ ...base.burns[0], model: 'finite' }],
  };
  const target = problem.targets[0] as { epoch: string; positionKm: Vec3; toleranceKm: number };
  let finitePlan: ManeuverPlan;
  let impulsivePlan: ManeuverPlan;
  beforeAll(async () => {
    finitePlan = await planManeuvers(parseProblem(problem), { verifyJacobian: true, monteCarlo: 'skip' });
    impulsivePlan = await planManeuvers(parseProblem({ ...problem, burns: [base.burns[0]] }), { monteCarlo: 'skip' });
  }, 120_000);

  describe('when a low-thrust burn retargets the two-body fixture', () => {
    it('should converge, cross-checked, to a finite burn of tens of minutes', () => {
      expect(finitePlan.status).toBe('converged');
      expect(finitePlan.crossCheck.passed).toBe(true);
      const b = finitePlan.burns[0];
      expect(b.model).toBe('finite');
      expect(b.finite!.durationS).toBeGreaterThan(600);
      expect(finitePlan.targets.every((t) => t.met)).toBe(true);
    });

    it('should carry a self-consistent finite block (rocket equation, ṁ = F/(Isp·g0), epochs)', () => {
      const f = finitePlan.burns[0].finite!;
      const mdot = ENGINE.thrustN / (ENGINE.ispS * STANDARD_GRAVITY_M_S2);
      expect(f.massFlowKgS).toBeCloseTo(mdot, 15);
      expect(f.massAfterKg).toBeCloseTo(f.massBeforeKg - mdot * f.durationS, 9);
      expect(f.propellantKg).toBeCloseTo(f.massBeforeKg - f.massAfterKg, 12);
      // Tsiolkovsky: Δv = Isp·g0·ln(m0/m1).
      expect(f.idealDeltaVMS).toBeCloseTo(ENGINE.ispS * STANDARD_GRAVITY_M_S2 * Math.log(f.massBeforeKg / f.massAfterKg), 9);
      expect(f.end.tdbS - f.start.tdbS).toBeCloseTo(f.durationS, 6);
      expect(Math.hypot(...f.directionInertial)).toBeCloseTo(1, 14);
      expect(f.start.utc).toMatch(/UTC$/);
      expect(f.finiteBurnLossMS).toBeCloseTo(f.idealDeltaVMS - f.impulsiveDeltaVMS, 12);
    });

    it('should report a positive finite-burn loss that is small against the Δv', () => {
      const f = finitePlan.burns[0].finite!;
      expect(f.finiteBurnLossMS).toBeGreaterThan(0);
      expect(f.finiteBurnLossMS).toBeLessThan(0.05 * f.impulsiveDeltaVMS);
    });

    it('should agree between the STM-chained and finite-difference Jacobians of pointing and duration', () => {
      // Measured 1.0e-7 (engine 22 N) during development; limit ~5x above.
      expect(finitePlan.sensitivities?.controls.map((c) => c.kind)).toEqual(['point0', 'point1', 'duration']);
      expect(finitePlan.sensitivities?.stmVersusFiniteDifference).toBeLessThan(5e-7);
    });

    it('should not carry the impulsive-approximation caveat on the finite burn, but the impulsive plan should', () => {
      expect(finitePlan.caveats.map((c) => c.code)).not.toContain('IMPULSIVE_APPROXIMATION_QUESTIONABLE');
      expect(impulsivePlan.caveats.map((c) => c.code)).toContain('IMPULSIVE_APPROXIMATION_QUESTIONABLE');
    });
  });

  describe('when each plan is re-flown by an independent integrator', () => {
    it('should meet the target with the finite plan read from its JSON', () => {
      const json = JSON.parse(JSON.stringify(finitePlan)) as ManeuverPlan;
      const f = json.burns[0].finite!;
      const y = odexFly(problem, { ...f, massKg: f.massBeforeKg, direction: f.directionLocal }, parseEpoch(target.epoch));
      const miss = Math.hypot(...target.positionKm.map((x, i) => x - y[i]));
      expect(miss).toBeLessThan(target.toleranceKm);
      // And where the plan says it arrives (components x, y, z of the position target).
      const achieved = json.targets.map((t) => t.achieved as number);
      const disagreement = Math.hypot(...achieved.map((x, i) => x - y[i]));
      // Measured: miss 5.5e-5 km (the corrector stops inside the 1e-4 km tolerance), plan vs odex 7.6e-8 km.
      expect(disagreement).toBeLessThan(5e-7);
    });

    it('should miss the target by far more than its tolerance with the impulsive plan flown as a centred burn', () => {
      const b = impulsivePlan.burns[0];
      const mdot = ENGINE.thrustN / (ENGINE.ispS * STANDARD_GRAVITY_M_S2);
      const direction = unit(b.deltaVInertialKmS);
      const flight: Flight = {
        startTdbS: b.epoch.tdbS - b.durationS / 2, durationS: b.durationS, thrustN: ENGINE.thrustN, massFlowKgS: mdot,
        massKg: b.massBeforeKg, axes: 'inertial', direction,
      };
      const y = odexFly(problem, flight, parseEpoch(target.epoch));
      const miss = Math.hypot(...target.positionKm.map((x, i) => x - y[i]));
      // Measured 3.28 km (the impulsive burn's gravity loss over a 15-minute arc).
      expect(miss).toBeGreaterThan(100 * target.toleranceKm);
    });
  });

  describe('when the cross-check re-flies the finite arcs', () => {
    it('should fly the arcs in Encke form for a Cowell plan and for an Encke plan alike', async () => {
      expect(finitePlan.crossCheck.method).toBe('encke');
      expect(finitePlan.crossCheck.message).toMatch(/finite-burn arcs: Encke form in the check, Cowell form in the plan/);
      const encke = await planManeuvers(parseProblem({ ...problem, forceModel: { ...problem.forceModel, method: 'encke' } }), { monteCarlo: 'skip' });
      expect(encke.status).toBe('converged');
      expect(encke.crossCheck.passed).toBe(true);
      expect(encke.crossCheck.method).toBe('cowell');
      expect(encke.crossCheck.message).toMatch(/finite-burn arcs: Encke form in the check, Cowell form in the plan/);
    }, 120_000);
  });

  describe('when the finite plan is dispersed with Gates execution errors', () => {
    it('should give Monte Carlo target σ that agree with the linear mapping (duration and pointing errors)', async () => {
      const n = 300;
      const plan = await planManeuvers(parseProblem({ ...problem, dispersion: { samples: n, seed: 11 } }));
      const linear = plan.dispersion.linear!.execution.targetSigmas;
      const mc = plan.dispersion.monteCarlo!;
      expect(mc.samples).toBe(n);
      expect(mc.failedSamples).toBe(0);
      // A sample σ has a relative standard error of about 1/√(2(n−1)) = 4.1 % for n = 300 (normal samples);
      // the limit, 15 %, is ~3.7 standard errors. Measured MC/linear ratios 1.051, 1.041, 1.049 (x, y, z);
      // the impulsive plan of the same problem and seed gives 1.054, 1.050, 1.052: the excess is this
      // sample's, not the finite-burn mapping's.
      linear.forEach((sigma, i) => {
        expect(Math.abs((mc.targetSigmas[i] as number) / sigma - 1)).toBeLessThan(0.15);
      });
    }, 120_000);
  });
});

import { describe, expect, it } from 'vitest';
import {
  attachMonteCarlo, parseProblem, planManeuvers, runDispersionSamples, summariseDispersion,
} from '../../planner/index.ts';
import type { ManeuverPlan, PlanProgress } from '../../planner/index.ts';
import { TRUE_DELTA_V_KMS, twoBodyProblem } from './two-body-fixture.ts';

describe('planManeuvers', () => {
  describe('when a two-body position target is reachable', () => {
    let plan: ManeuverPlan;
    const progress: PlanProgress[] = [];
    it('should converge to the Δv the target was built from', async () => {
      plan = await planManeuvers(parseProblem(twoBodyProblem()), { onProgress: (p) => progress.push(p), verifyJacobian: true });
      expect(plan.status).toBe('converged');
      expect(plan.burns).toHaveLength(1);
      plan.burns[0].deltaVInertialKmS.forEach((v, k) => expect(Math.abs(v - TRUE_DELTA_V_KMS[k])).toBeLessThan(1e-7));
      expect(plan.targets.every((t) => t.met)).toBe(true);
    });
    it('should carry the contract fields of a plan', () => {
      expect(plan.planFormatVersion).toBe(1);
      expect(plan.problemHash).toMatch(/^[0-9a-f]{64}$/);
      expect(plan.softwareVersion).toMatch(/^veer \d+\.\d+\.\d+/);
      expect(plan.targetSetKey.startsWith('Test craft/')).toBe(true);
      expect(plan.caveats[0].code).toBe('PROPOSAL_REQUIRES_REVIEW');
      expect(plan.trajectory.length).toBeGreaterThan(10);
      expect(JSON.parse(JSON.stringify(plan))).toEqual(plan);
    });
    it('should give the burn in every frame with propellant by the rocket equation', () => {
      const b = plan.burns[0];
      const mag = Math.hypot(...b.deltaVInertialKmS);
      expect(Math.hypot(...b.deltaVRtnKmS)).toBeCloseTo(mag, 12);
      expect(Math.hypot(...b.deltaVVnbKmS)).toBeCloseTo(mag, 12);
      // m_p = m0 (1 − exp(−Δv / (Isp g0))), g0 = 9.80665 m/s² (3rd CGPM 1901).
      expect(b.propellantKg).toBeCloseTo(500 * (1 - Math.exp(-(mag * 1000) / (220 * 9.80665))), 9);
      expect(b.durationS).toBeCloseTo((b.propellantKg * 220 * 9.80665) / 22, 6);
    });
    it('should agree between the STM and finite-difference Jacobians', () => {
      // Observed 2.5e-9 (2026-12, 1 mm/s central differences: step noise; it was 6e-5 before the integrator
      // rounded its steps to representable intervals); limit 4× that.
      expect(plan.sensitivities?.stmVersusFiniteDifference).toBeLessThan(1e-8);
    });
    it('should report progress through every stage, ending at 1', () => {
      const stages = progress.map((p) => p.stage);
      for (const s of ['validating', 'correcting', 'dispersion', 'done'] as const) expect(stages).toContain(s);
      expect(progress.at(-1)?.fraction).toBe(1);
      for (let i = 1; i < progress.length; i++) expect(progress[i].fraction).toBeGreaterThanOrEqual(progress[i - 1].fraction);
    });
    it('should give the same Monte Carlo result whatever the batching', async () => {
      const problem = parseProblem(twoBodyProblem());
      const whole = await runDispersionSamples(problem, plan, { seed: 7, firstIndex: 0, count: 6 });
      const a = await runDispersionSamples(problem, plan, { seed: 7, firstIndex: 0, count: 2 });
      const b = await runDispersionSamples(problem, plan, { seed: 7, firstIndex: 2, count: 4 });
      expect([...b, ...a].sort((x, y) => x.index - y.index)).toEqual(whole);
      const summary = summariseDispersion(problem, plan, [...b, ...a]);
      expect(summary).toEqual(summariseDispersion(problem, plan, whole));
      const attached = attachMonteCarlo(plan, summary);
      expect(attached.dispersion.monteCarlo?.samples).toBe(6);
      expect(attached.caveats.map((c) => c.code)).toContain('PROPOSAL_REQUIRES_REVIEW');
    });
  });

  describe('when the burn asks for a Lambert seed', () => {
    it('should start from the two-body transfer and need no Newton step on a two-body problem', async () => {
      const base = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
      const plan = await planManeuvers(parseProblem({ ...base, burns: [{ ...base.burns[0], guessFromLambert: true }] }), { monteCarlo: 'skip' });
      expect(plan.status).toBe('converged');
      expect(plan.convergence.seeds).toHaveLength(1);
      expect(plan.iterations).toHaveLength(1);
      plan.burns[0].deltaVInertialKmS.forEach((v, k) => expect(Math.abs(v - TRUE_DELTA_V_KMS[k])).toBeLessThan(1e-7));
    });
  });

  describe('when the epoch of the burn is free too', () => {
    it('should match STM and finite-difference Jacobians including the epoch column', async () => {
      const base = twoBodyProblem();
      const burn = { ...base.burns[0], epochWindow: { earliest: '2026-01-01T00:05:00 TDB', latest: '2026-01-01T00:15:00 TDB' } };
      const plan = await planManeuvers(parseProblem({ ...base, burns: [burn], dispersion: { samples: 0, seed: 1 } }), { verifyJacobian: true, monteCarlo: 'skip' });
      expect(plan.status).toBe('converged');
      expect(plan.sensitivities?.controls.map((c) => c.kind)).toEqual(['dv0', 'dv1', 'dv2', 'epoch']);
      // Minimum-norm steps (4 controls, 3 targets). Observed 3.8e-6 (2026-12), all in the epoch column and
      // the same for 0.05, 0.5 and 5 s steps: the epoch column holds the turn of the burn's local frame only
      // to first order. The Δv columns agree to 2e-9 (finite-difference noise). Limit about 5× the observed.
      expect(plan.sensitivities?.stmVersusFiniteDifference).toBeLessThan(2e-5);
    });
  });

  describe('when the targets are a periapsis altitude and inclination (closest approach to the central body)', () => {
    it('should meet both with a minimum-norm solution and matching Jacobians', async () => {
      const base = twoBodyProblem({ dispersion: { samples: 0, seed: 1 } });
      const plan = await planManeuvers(parseProblem({
        ...base,
        targets: [
          { kind: 'periapsis-altitude', body: 'earth', altitudeKm: 500, toleranceKm: 0.01 },
          { kind: 'periapsis-inclination', body: 'earth', referencePlane: 'equator', inclinationDeg: 9, toleranceDeg: 0.001 },
        ],
      }), { verifyJacobian: true, monteCarlo: 'skip' });
      expect(plan.status).toBe('converged');
      expect(plan.convergence.leastSquares).toBe(false);
      expect(plan.approaches[0].altitudeKm).toBeCloseTo(500, 1);
      expect(plan.targets[1].achieved).toBeCloseTo(9, 2);
      // Observed 1.1e-7 (2026-12, 1 mm/s central differences: step noise); limit about 5× that.
      expect(plan.sensitivities?.stmVersusFiniteDifference).toBeLessThan(5e-7);
    });
  });

  describe('when the target cannot be reached', () => {
    it('should resolve to a not-converged plan with no burns and a critical caveat', async () => {
      const base = twoBodyProblem();
      const plan = await planManeuvers(parseProblem({
        ...base, corrector: { maxIterations: 2, maxStepKmS: 0.001, maxEpochStepS: 60 },
      }));
      expect(plan.status).toBe('not-converged');
      expect(plan.burns).toEqual([]);
      expect(plan.convergence.lastIterate?.burnsInertialKmS).toHaveLength(1);
      expect(plan.caveats.find((c) => c.code === 'NOT_CONVERGED')?.severity).toBe('critical');
      expect(plan.crossCheck.passed).toBe(false);
      expect(plan.dispersion.linear).toBeNull();
    });
  });

  describe('when targets outnumber free variables', () => {
    it('should say the solution is least squares', async () => {
      const base = twoBodyProblem();
      const plan = await planManeuvers(parseProblem({
        ...base, burns: [{ ...base.burns[0], freeComponents: [true, false, false] }], dispersion: { samples: 0, seed: 1 },
      }), { monteCarlo: 'skip' });
      expect(plan.convergence.leastSquares).toBe(true);
      expect(plan.status).toBe('not-converged');
      expect(plan.convergence.outcome).toBe('least-squares-stationary');
      expect(plan.caveats.map((c) => c.code)).toContain('TARGETS_MET_IN_LEAST_SQUARES_ONLY');
    });
  });

  describe('when cancelled', () => {
    it('should reject with CancelledError', async () => {
      const controller = new AbortController();
      const run = planManeuvers(parseProblem(twoBodyProblem()), {
        signal: controller.signal,
        onProgress: (p) => { if (p.stage === 'correcting') controller.abort(); },
      });
      await expect(run).rejects.toMatchObject({ name: 'CancelledError' });
    });
  });
});

/**
 * The solution's evaluation is the corrector's own last evaluation with the STM (it collects the plot
 * samples too), and the coast from the start to the burn is flown once for all evaluations: no extra
 * propagation, and the same numbers a fresh evaluation at the solution gives.
 * This rests on two properties of the propagator checked here on the demo flyby: collecting samples
 * (dense output) changes no step, and carrying the STM changes no state (the step control sees the state
 * alone), so a leg past the last station may run without it.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { parseProblem, planManeuvers } from '../../planner/index.ts';
import { planningContext } from '../../planner/plan/planning-context.ts';
import { trajectoryPoints } from '../../planner/plan/plan-parts.ts';
import { controlSettings } from '../../planner/targeting/finite-controls.ts';
import { evaluateTrajectory, type TrajectoryEvaluation } from '../../planner/targeting/evaluate-trajectory.ts';
import { StartLegMemo, type StartLeg } from '../../planner/targeting/start-leg-memo.ts';
import type { PropagationResult } from '../../propagator/index.ts';
import { twoBodyProblem } from './two-body-fixture.ts';

/** Propagations of one evaluation of the two-body fixture: start → burn, burn → target epoch, → end. */
const LEGS = 3;

describe('the solution evaluation', () => {
  describe('when the corrector converges with the STM on the two-body problem', () => {
    const problem = parseProblem(twoBodyProblem({ dispersion: { samples: 0, seed: 7 } }));

    it('should count no propagation beyond the corrector evaluations and the cross-check', async () => {
      const plan = await planManeuvers(problem, { monteCarlo: 'skip' });
      expect(plan.status).toBe('converged');
      const steps = plan.iterations.filter((it) => it.jacobianSource === 'stm');
      // Every Newton step took its full length, so the corrector made one evaluation per step plus the first.
      expect(steps.every((it) => !(it.note ?? '').includes('line search'))).toBe(true);
      expect(steps.length).toBeGreaterThan(0);
      // The coast to the burn is flown once (it does not depend on the controls), the other legs once per
      // evaluation, then the cross-check's LEGS. Before the solution reused the corrector's last evaluation
      // and the coast was kept, this was (steps + 2) · LEGS + LEGS.
      expect(plan.effort.propagations).toBe(1 + (steps.length + 1) * (LEGS - 1) + LEGS);
    });

    it('should give the trajectory, target values and Jacobian of a fresh evaluation at the solution', async () => {
      const plan = await planManeuvers(problem, { monteCarlo: 'skip' });
      const ctx = planningContext(problem);
      const x = plan.iterations.at(-1)!.controls;
      const fresh = await evaluateTrajectory(ctx.evaluation, controlSettings(problem, ctx.epochs, ctx.layout, x), {
        method: problem.forceModel.method, relativeTolerance: problem.forceModel.relativeTolerance, withStm: true,
        outputStepS: (ctx.epochs.endTdbS - ctx.epochs.initialTdbS) / 400,
      });
      if (!fresh.ok) throw new Error(fresh.reason);
      expect(plan.sensitivities?.jacobian).toEqual(fresh.jacobian);
      expect(plan.targets.map((t) => t.achieved)).toEqual(fresh.values);
      expect(plan.trajectory).toEqual(trajectoryPoints(fresh.samples, problem.forceModel.centralBody, ctx.ephemeris));
    });
  });

  describe('when the demo flyby is evaluated with and without the STM and samples', () => {
    const demo = JSON.parse(readFileSync(new URL('../../examples/flyby-demo.json', import.meta.url), 'utf8')) as Record<string, unknown>;
    const problem = parseProblem({ ...demo, dispersion: { samples: 0, seed: 1 } });
    const ctx = planningContext(problem);
    const settings = controlSettings(problem, ctx.epochs, ctx.layout, ctx.layout.initial);
    const outputStepS = (ctx.epochs.endTdbS - ctx.epochs.initialTdbS) / 400;
    const run = async (withStm: boolean, samples: boolean): Promise<TrajectoryEvaluation> => {
      const ev = await evaluateTrajectory(ctx.evaluation, settings, {
        method: problem.forceModel.method, relativeTolerance: problem.forceModel.relativeTolerance, withStm,
        outputStepS: samples ? outputStepS : undefined,
      });
      if (!ev.ok) throw new Error(ev.reason);
      return ev;
    };

    it('should reach the same states and target values to the last bit', async () => {
      const [stmSamples, stateSamples, stmOnly] = [await run(true, true), await run(false, true), await run(true, false)];
      expect(stmSamples.samples.length).toBeGreaterThan(400);
      expect(stmSamples.samples).toEqual(stateSamples.samples);
      for (const ev of [stateSamples, stmOnly]) {
        expect(ev.final).toEqual(stmSamples.final);
        expect(ev.values).toEqual(stmSamples.values);
        expect(ev.approaches).toEqual(stmSamples.approaches);
      }
      expect(stmOnly.jacobian).toEqual(stmSamples.jacobian);
      expect(stmOnly.initialStateJacobian).toEqual(stmSamples.initialStateJacobian);
    });
  });

  describe('when a start coast is looked up in the memo', () => {
    const problem = parseProblem(twoBodyProblem({ dispersion: { samples: 0, seed: 7 } }));
    const ctx = planningContext(problem);
    const leg: StartLeg = {
      initial: ctx.evaluation.initial, problem, ephemeris: ctx.ephemeris, endTdbS: ctx.epochs.initialTdbS + 600, massKg: 500,
      method: 'cowell', arcMethod: undefined, relativeTolerance: 1e-12, withStm: true, switching: false, outputStepS: 18,
    };
    const result = { outcome: 'finished' } as PropagationResult;

    it('should find only exactly the same coast', () => {
      const memo = new StartLegMemo();
      memo.keep(leg, result);
      expect(memo.find({ ...leg })).toBe(result);
      expect(memo.find({ ...leg, initial: { ...leg.initial } })).toBeUndefined();
      expect(memo.find({ ...leg, problem: { ...problem } })).toBeUndefined();
      for (const change of [{ endTdbS: leg.endTdbS + 1e-6 }, { massKg: 499.999 }, { withStm: false }, { outputStepS: undefined },
        { method: 'encke' as const }, { relativeTolerance: 1e-13 }, { switching: true }, { arcMethod: 'cowell' as const }]) {
        expect(memo.find({ ...leg, ...change })).toBeUndefined();
      }
    });

    it('should not keep a coast that did not finish', () => {
      const memo = new StartLegMemo();
      memo.keep(leg, { ...result, outcome: 'impact' });
      expect(memo.find(leg)).toBeUndefined();
    });
  });
});

/**
 * The non-linear path's re-plan of a finite burn: a real corrector run on the burn's own finite controls
 * (two pointing offsets and the duration, the plan's finite stage: finiteControlLayout / controlSettings),
 * seeded from the nominal finite burn, from the navigation estimate at the nominal ignition, with the later
 * burns as planned, so that every component returns to the nominal sequence's values within
 * replanToleranceFraction × its tolerance. The answer is the commanded burn as its equivalent Δv (the ideal
 * rocket-equation Δv from the sample's mass, along the commanded direction in the axes at the estimate) and
 * what is needed to fly it with an execution error (finiteSettingFor). Ignition stays the plan's.
 * States J2000 equatorial, integration centre; km, s, km/s, kg, N; TDB s from J2000.
 */
import type { StateVector, Vec3 } from '../../propagator/index.ts';
import { axesToInertial, localAxes } from '../../propagator/index.ts';
import { runCorrector } from '../corrector/differential-corrector.ts';
import { deltaVFromPropellantKmS } from '../maneuver-math.ts';
import type { FiniteFlight } from '../plan/finite-stage.ts';
import type { PlanningContext } from '../plan/planning-context.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import { controlLayout } from '../targeting/controls.ts';
import { acrossOf, controlSettings, finiteControlLayout } from '../targeting/finite-controls.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import type { BudgetNominal } from '../../contract/budget-types.ts';
import { contextFrom, nominalSettings } from './budget-nominal.ts';

/** Re-plans finite burn k from the estimated state at its ignition (mass `massKg`, kg); see the file comment. */
export async function replanFiniteBurn(request: BudgetRequest, ctx: PlanningContext, nominal: BudgetNominal, k: number, estimate: StateVector,
  massKg: number, signal?: AbortSignal): Promise<{ commanded: Vec3; flight: FiniteFlight } | { failed: string }> {
  const burn = nominal.burns[k];
  const { ispS } = ctx.problem.spacecraft.engine;
  const settings = nominalSettings(nominal.plan, ispS);
  const own = settings[k].finite!;
  // A one-burn problem at the nominal ignition (no window): the finite stage's controls of this burn only.
  const problem = { ...ctx.problem, burns: [ctx.problem.burns[k]] };
  const epochs = { ...ctx.epochs, burnTdbS: [own.startTdbS], burnWindowTdbS: [undefined] };
  const impulsive = controlLayout(problem, epochs);
  const layout = finiteControlLayout(problem, epochs, impulsive, impulsive.initial, [{
    direction: own.directionLocal, across: acrossOf(own.directionLocal), startTdbS: own.startTdbS, durationS: own.durationS,
    thrustN: own.thrustN, massFlowKgS: own.massFlowKgS, impulsiveDeltaVKmS: Math.hypot(...burn.deltaVInertialKmS),
  }]);
  const evalCtx = contextFrom(ctx, estimate, massKg, layout.descriptors.map((d) => ({ burnIndex: 0, kind: d.kind })));
  const later = settings.slice(k + 1);
  const m = ctx.targetCount;
  const fm = ctx.problem.forceModel;
  const result = await runCorrector({
    initial: layout.initial, tolerances: ctx.components.slice(0, m).map((c) => c.tolerance * request.replanToleranceFraction),
    controlScales: layout.scales, maxStep: layout.maxStep, finiteDifferenceStep: layout.finiteDifferenceStep,
    lower: layout.lower, upper: layout.upper, maxIterations: ctx.problem.corrector.maxIterations,
    evaluate: async (x, withJacobian) => {
      const ev = await evaluateTrajectory(evalCtx, [...controlSettings(problem, epochs, layout, x), ...later],
        { method: fm.method, relativeTolerance: fm.relativeTolerance, withStm: withJacobian, signal });
      if (!ev.ok) return { ok: false, reason: ev.reason };
      return { ok: true, residuals: ev.values.slice(0, m).map((v, i) => v - nominal.nominalValues[i]), jacobian: ev.jacobian ? ev.jacobian.slice(0, m) : undefined };
    },
  });
  if (result.outcome !== 'converged') return { failed: `re-plan of ${burn.label}: ${result.outcome}: ${result.message}` };
  const f = controlSettings(problem, epochs, layout, result.controls)[0].finite!;
  if (f.massFlowKgS * f.durationS >= massKg) return { failed: `re-plan of ${burn.label}: a ${f.durationS.toFixed(1)} s burn needs more than the ${massKg.toFixed(1)} kg on board` };
  const axesAtStart = localAxes(burn.frame, estimate.positionKm, estimate.velocityKmS);
  const dv = deltaVFromPropellantKmS(f.massFlowKgS * f.durationS, massKg, ispS);
  const u = axesToInertial(axesAtStart, f.directionLocal);
  return {
    commanded: [u[0] * dv, u[1] * dv, u[2] * dv],
    flight: { startTdbS: f.startTdbS, thrustN: f.thrustN, massFlowKgS: f.massFlowKgS, massBeforeKg: massKg, axes: burn.frame, axesAtStart },
  };
}

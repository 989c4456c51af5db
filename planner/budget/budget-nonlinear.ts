/**
 * The non-linear path of the Δv budget: one sample with real propagation and a real corrector run per
 * burn. The true state starts at nominal + drawn offset; at each burn the navigation estimate (true + drawn
 * knowledge error) is re-planned: burn k's free components are solved by the differential corrector so
 * that, with the later burns as planned (impulses at their nominal inertial Δv, finite burns as flown), every component returns to the nominal
 * sequence's values within replanToleranceFraction × its tolerance. The commanded burn (local axes taken at
 * the estimate) is executed with the drawn Gates errors on the true state, which propagates on.
 * A finite burn is re-planned on its own finite controls (budget-replan-finite.ts) and flown from the true
 * state at its ignition with the drawn Gates errors on its equivalent Δv, mapped to duration and pointing
 * as the plan's Monte Carlo does (finiteSettingFor); the sample goes on from its cut-off with the mass
 * left. A re-plan that does not converge stops the sample (counted, never hidden). States J2000 equatorial,
 * integration centre; km, s, km/s, kg; TDB s from J2000.
 */
import type { StateVector, Vec3 } from '../../propagator/index.ts';
import { runCorrector } from '../corrector/differential-corrector.ts';
import { executedDeltaV } from '../dispersion/gates.ts';
import { exhaustVelocityKmS } from '../maneuver-math.ts';
import type { PlanningContext } from '../plan/planning-context.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import type { BurnSetting } from '../targeting/controls.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import { propagateSegment } from '../targeting/propagate-segment.ts';
import { radiusOf } from '../targeting/target-components.ts';
import type { BudgetDraw } from './budget-draws.ts';
import { contextFrom, nominalSettings } from './budget-nominal.ts';
import { replanFiniteBurn } from './budget-replan-finite.ts';
import { finiteSettingFor } from '../plan/finite-stage.ts';
import { finiteSpec } from '../targeting/finite-arc.ts';
import type { BudgetNominal, BudgetSample, NominalBurn, SampleBurn } from '../../contract/budget-types.ts';
import { axesToInertial, localAxes } from '../../propagator/index.ts';

const offsetState = (s: StateVector, d: readonly number[]): StateVector => ({
  ...s,
  positionKm: [s.positionKm[0] + d[0], s.positionKm[1] + d[1], s.positionKm[2] + d[2]],
  velocityKmS: [s.velocityKmS[0] + d[3], s.velocityKmS[1] + d[4], s.velocityKmS[2] + d[5]],
});

/** Re-plans burn k from the estimated state; the commanded inertial Δv, or null when not converged. */
async function replanBurn(request: BudgetRequest, ctx: PlanningContext, nominal: BudgetNominal, k: number, estimate: StateVector,
  massKg: number, signal?: AbortSignal): Promise<{ commanded: Vec3 } | { failed: string }> {
  const burn: NominalBurn = nominal.burns[k];
  const freeIdx = [0, 1, 2].filter((j) => burn.freeComponents[j]);
  const layoutIdx = ctx.layout.descriptors.flatMap((d, j) => (d.burnIndex === k && d.kind !== 'epoch' ? [j] : []));
  const controlMap = freeIdx.map((j) => ({ burnIndex: 0, kind: (['dv0', 'dv1', 'dv2'] as const)[j] }));
  const evalCtx = contextFrom(ctx, estimate, massKg, controlMap);
  const later: BurnSetting[] = nominalSettings(nominal.plan, ctx.problem.spacecraft.engine.ispS).slice(k + 1);
  const settingsFor = (x: readonly number[]): BurnSetting[] => {
    const local = [...burn.deltaVLocalKmS] as Vec3;
    freeIdx.forEach((j, c) => { local[j] = x[c]; });
    return [{ epochTdbS: burn.epochTdbS, frame: burn.frame, deltaVLocalKmS: local }, ...later];
  };
  const m = ctx.targetCount;
  const fm = ctx.problem.forceModel;
  const result = await runCorrector({
    initial: freeIdx.map((j) => burn.deltaVLocalKmS[j]),
    tolerances: ctx.components.slice(0, m).map((c) => c.tolerance * request.replanToleranceFraction),
    controlScales: layoutIdx.map((j) => ctx.layout.scales[j]), maxStep: layoutIdx.map((j) => ctx.layout.maxStep[j]),
    finiteDifferenceStep: layoutIdx.map((j) => ctx.layout.finiteDifferenceStep[j]),
    lower: layoutIdx.map((j) => ctx.layout.lower[j]), upper: layoutIdx.map((j) => ctx.layout.upper[j]),
    maxIterations: ctx.problem.corrector.maxIterations,
    evaluate: async (x, withJacobian) => {
      const ev = await evaluateTrajectory(evalCtx, settingsFor(x), { method: fm.method, relativeTolerance: fm.relativeTolerance, withStm: withJacobian, signal });
      if (!ev.ok) return { ok: false, reason: ev.reason };
      return { ok: true, residuals: ev.values.slice(0, m).map((v, i) => v - nominal.nominalValues[i]), jacobian: ev.jacobian ? ev.jacobian.slice(0, m) : undefined };
    },
  });
  if (result.outcome !== 'converged') return { failed: `re-plan of ${burn.label}: ${result.outcome}: ${result.message}` };
  const local = settingsFor(result.controls)[0].deltaVLocalKmS;
  return { commanded: axesToInertial(localAxes(burn.frame, estimate.positionKm, estimate.velocityKmS), local) };
}

/** One non-linear sample for its draws; see the file comment. */
export async function nonlinearBudgetSample(request: BudgetRequest, ctx: PlanningContext, nominal: BudgetNominal, draw: BudgetDraw,
  signal?: AbortSignal): Promise<BudgetSample> {
  const errors = request.problem.executionErrors ?? null;
  const exhaust = exhaustVelocityKmS(request.problem.spacecraft.engine.ispS);
  const fm = ctx.problem.forceModel;
  const opts = { method: fm.method, relativeTolerance: fm.relativeTolerance, withStm: false, signal } as const;
  let state = draw.initialOffset ? offsetState(ctx.evaluation.initial, draw.initialOffset) : ctx.evaluation.initial;
  let mass = request.problem.spacecraft.massKg;
  const burns: SampleBurn[] = [];
  const stopped = (reason: string, impact: boolean, notConvergedAt: number | null = null): BudgetSample => ({
    index: draw.index, burns, delivered: nominal.nominalValues.map(() => null), closestApproachAltitudeKm: null,
    impact, notConvergedAt, stopReason: reason,
  });
  for (let k = 0; k < nominal.burns.length; k++) {
    const b = nominal.burns[k];
    if (b.epochTdbS > state.epochTdbS) {
      const seg = await propagateSegment(ctx.problem, ctx.ephemeris, state, mass, b.epochTdbS, opts);
      if (seg.outcome !== 'finished') return stopped(`propagation to ${b.label} ended '${seg.outcome}'`, seg.outcome === 'impact');
      state = seg.final;
    }
    const estimate = offsetState(state, draw.knowledgeOffsets[k]);
    if (b.model === 'finite') {
      const plan = await replanFiniteBurn(request, ctx, nominal, k, estimate, mass, signal);
      if ('failed' in plan) return stopped(plan.failed, false, k);
      const executed = errors ? executedDeltaV(plan.commanded, errors, draw.executionNormals[k]) : plan.commanded;
      const spec = finiteSpec(finiteSettingFor(plan.flight, executed, ctx.problem.spacecraft.engine.ispS));
      const arc = await propagateSegment(ctx.problem, ctx.ephemeris, state, mass, spec.startTdbS + spec.durationS, { ...opts, finiteBurns: [spec] });
      if (arc.outcome !== 'finished') return stopped(`${b.label} ended '${arc.outcome}'`, arc.outcome === 'impact');
      burns.push({ commandedKmS: plan.commanded, magnitudeMS: Math.hypot(...plan.commanded) * 1000, propellantKg: mass - (arc.finalMassKg as number) });
      state = arc.final;
      mass = arc.finalMassKg as number;
      const next = nominal.burns[k + 1];
      if (next && next.epochTdbS < state.epochTdbS) return stopped(`${b.label} ends after ${next.label} starts`, false);
      continue;
    }
    const plan = await replanBurn(request, ctx, nominal, k, estimate, mass, signal);
    if ('failed' in plan) return stopped(plan.failed, false, k);
    const executed = errors ? executedDeltaV(plan.commanded, errors, draw.executionNormals[k]) : plan.commanded;
    state = offsetState(state, [0, 0, 0, ...executed]);
    const propellantKg = -mass * Math.expm1(-Math.hypot(...executed) / exhaust);
    // Carried as evaluateTrajectory does (mass × exp(−|Δv|/c)), so a sample's dynamics match a plan's.
    mass *= Math.exp(-Math.hypot(...executed) / exhaust);
    burns.push({ commandedKmS: plan.commanded, magnitudeMS: Math.hypot(...plan.commanded) * 1000, propellantKg });
  }
  const ev = await evaluateTrajectory(contextFrom(ctx, state, mass), [], opts);
  if (!ev.ok) return stopped(ev.reason, ev.impact !== null);
  const bp = nominal.bPlane;
  const approach = bp ? ev.approaches.find((a) => a.body === bp.body) : ev.approaches[0];
  return {
    index: draw.index, burns, delivered: ev.values.slice(),
    closestApproachAltitudeKm: approach ? approach.distanceKm - radiusOf(approach.body) : null,
    impact: false, notConvergedAt: null, stopReason: null,
  };
}

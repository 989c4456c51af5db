/**
 * The nominal sequence of a Δv budget and its linear model, from the converged plan:
 * - the nominal burns (inertial Δv, epochs) re-evaluated for their pre-burn states;
 * - per burn k, J_k = d(components)/d(state just before burn k) with the later burns held as planned
 *   (impulses at their nominal inertial Δv, finite burns at their pointing and duration; an STM evaluation
 *   started at that state), and the gain that re-plans burn k's free components to null the target
 *   deviation: G_k = A_f·(W·J_k,v·A_f)⁺·W·J_k (W = 1/tolerance on the target rows, A_f = the burn's free local axes; ⁺ = SVD pseudo-inverse: minimum norm when the free components
 *   outnumber the targets, least squares otherwise — the corrector's own step);
 * - the state transition matrices between burns (initial → first burn, burn k → burn k+1).
 * Finite burns (the plan's finite stage, flown again from the plan's finite block by finiteSettingFor) enter
 * through their equivalent Δv (the ideal rocket-equation Δv along the thrust direction at ignition): their
 * duration and two pointing angles move it in all three directions, so every component is free, and J_k,v
 * is d(components)/d(equivalent Δv) from the STM of the arc (finite-arc.ts: along the burn a duration
 * change, across it a pointing change). Their "pre-burn" state is the state at ignition, and
 * deltaVToNext carries an equivalent-Δv change through the arc to the next burn. The mass's effect on later
 * arcs is left out of the linear model (second order in the correction).
 * Everything is plain data so sample batches on other threads or workers can use it.
 * States J2000 equatorial, integration centre; km, s, km/s, kg; TDB s from J2000.
 */
import { InvalidInputError } from '../../propagator/index.ts';
import type { StateVector, Vec3 } from '../../propagator/index.ts';
import { covarianceBetweenFrames, identity, pseudoSolve, rowsOf6, svd } from '../../propagator/index.ts';
import type { ManeuverPlan } from '../../contract/plan-types.ts';
import type { PlanningContext } from '../plan/planning-context.ts';
import { approachImpactRadiusKm, vInfinityKmS } from '../plan/linear-dispersion.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import type { BurnSetting } from '../targeting/controls.ts';
import { evaluateTrajectory } from '../targeting/evaluate-trajectory.ts';
import type { EvaluationContext, TrajectoryEvaluation } from '../targeting/evaluate-trajectory.ts';
import { propagateSegment } from '../targeting/propagate-segment.ts';
import { gmOf, radiusOf } from '../targeting/target-components.ts';
import type { BudgetNominal, NominalBurn } from '../../contract/budget-types.ts';
import { localAxes } from '../../propagator/index.ts';
import { finiteSpec, equivalentDeltaV } from '../targeting/finite-arc.ts';
import { dispersedSetting } from '../plan/finite-stage.ts';

const vec = (s: StateVector): number[] => [...s.positionKm, ...s.velocityKmS];

/** The evaluation context started at `state` (J2000 equatorial) with the spacecraft's mass there. */
export function contextFrom(ctx: PlanningContext, state: StateVector, massKg: number, controlMap: EvaluationContext['controlMap'] = []): EvaluationContext {
  const problem = { ...ctx.problem, spacecraft: { ...ctx.problem.spacecraft, massKg } };
  return { ...ctx.evaluation, problem, initial: state, controlMap };
}

/** The plan's burns as evaluator settings (epochs as planned, free windows already solved): impulsive burns
 * as their inertial Δv, finite burns as planned (the plan's Monte Carlo mapping at zero error). */
export function nominalSettings(plan: ManeuverPlan, ispS: number): BurnSetting[] {
  return plan.burns.map((b) => dispersedSetting(b, [...b.deltaVInertialKmS] as Vec3, ispS));
}

/** Burn k's re-plan gain (3x6, inertial km/s per unit state deviation) from d(targets)/d(state) `jacobian`
 * and d(targets)/d(inertial Δv) `deltaVJacobian` (components x 3); see the file comment. */
function burnGain(ctx: PlanningContext, jacobian: number[][], deltaVJacobian: number[][], axes: [Vec3, Vec3, Vec3], free: readonly boolean[]): number[][] {
  const m = ctx.targetCount;
  const freeAxes = axes.filter((_, j) => free[j]);
  const w = ctx.components.slice(0, m).map((c) => 1 / c.tolerance);
  // W·J_v·A_f: target rows scaled by 1/tolerance, columns = the free local axes.
  const jv = deltaVJacobian.slice(0, m).map((row, i) => freeAxes.map((a) => w[i] * (row[0] * a[0] + row[1] * a[1] + row[2] * a[2])));
  const d = svd(jv);
  const columns = [0, 1, 2, 3, 4, 5].map((c) => {
    const { x } = pseudoSolve(d, jacobian.slice(0, m).map((row, i) => w[i] * row[c]));
    return [0, 1, 2].map((k) => freeAxes.reduce((acc, a, j) => acc + a[k] * x[j], 0));
  });
  return [0, 1, 2].map((k) => columns.map((col) => col[k]));
}

function requireOk(ev: Awaited<ReturnType<typeof evaluateTrajectory>>, what: string): TrajectoryEvaluation {
  if (!ev.ok) throw new InvalidInputError('problem', `the nominal sequence could not be evaluated (${what}): ${ev.reason}`);
  return ev;
}

type NominalOptions = { method: PlanningContext['problem']['forceModel']['method']; relativeTolerance: number; signal?: AbortSignal };

/** Burn k of the nominal model from the whole sequence's evaluation; `fromK` is the evaluation (with the
 * STM) started just before it (at ignition for a finite burn). */
async function nominalBurn(ctx: PlanningContext, plan: ManeuverPlan, settings: BurnSetting[], k: number, pre: StateVector,
  fromK: TrajectoryEvaluation, opts: NominalOptions): Promise<NominalBurn> {
  const b = ctx.problem.burns[k];
  const pb = plan.burns[k];
  const finite = settings[k].finite !== undefined;
  const axes = localAxes(b.frame, pre.positionKm, pre.velocityKmS);
  const local = b.frame === 'RTN' ? pb.deltaVRtnKmS : b.frame === 'VNB' ? pb.deltaVVnbKmS : pb.deltaVInertialKmS;
  const stateJ = fromK.initialStateJacobian as number[][];
  // An impulse adds to the velocity (J_v = the velocity columns); a finite burn's equivalent Δv has its own.
  const dvJ = finite ? (fromK.burnJacobians as number[][][])[0] : stateJ.map((row) => row.slice(3, 6));
  const free: [boolean, boolean, boolean] = finite ? [true, true, true] : [...b.freeComponents] as [boolean, boolean, boolean];
  let transitionToNext: number[][] | null = null;
  let deltaVToNext: number[][] | null = null;
  if (k + 1 < settings.length) {
    const next = settings[k + 1].epochTdbS;
    const dv = pb.deltaVInertialKmS;
    const from: StateVector = finite ? pre : { ...pre, velocityKmS: [pre.velocityKmS[0] + dv[0], pre.velocityKmS[1] + dv[1], pre.velocityKmS[2] + dv[2]] };
    const spec = finite ? finiteSpec(settings[k]) : null;
    const seg = await propagateSegment(ctx.problem, ctx.ephemeris, from, finite ? pb.massBeforeKg : pb.massAfterKg, next,
      { ...opts, withStm: true, finiteBurns: spec ? [spec] : undefined });
    if (seg.outcome !== 'finished' || !seg.stm) throw new InvalidInputError('problem', `propagation between burns ${k + 1} and ${k + 2} ended '${seg.outcome}'`);
    transitionToNext = rowsOf6(seg.stm);
    if (spec) deltaVToNext = equivalentDeltaV(seg, seg.finiteBurns![0], spec, axes).b;
  }
  return {
    label: pb.label, epochTdbS: settings[k].epochTdbS, frame: b.frame, deltaVInertialKmS: [...pb.deltaVInertialKmS] as Vec3,
    deltaVLocalKmS: [...local] as Vec3, freeComponents: free, preBurnState: vec(pre), massBeforeKg: pb.massBeforeKg,
    gain: burnGain(ctx, stateJ, dvJ, axes, free), transitionToNext,
    ...(finite ? { model: 'finite' as const, deltaVToNext } : {}),
  };
}

/** Builds the nominal model of a converged plan; see the file comment. */
export async function budgetNominal(request: BudgetRequest, ctx: PlanningContext, plan: ManeuverPlan, signal?: AbortSignal): Promise<BudgetNominal> {
  if (plan.status !== 'converged') throw new InvalidInputError('problem', 'a Δv budget needs a converged nominal plan');
  const fm = ctx.problem.forceModel;
  const opts = { method: fm.method, relativeTolerance: fm.relativeTolerance, signal } as const;
  const settings = nominalSettings(plan, ctx.problem.spacecraft.engine.ispS);
  const whole = requireOk(await evaluateTrajectory({ ...ctx.evaluation, controlMap: [] }, settings, { ...opts, withStm: false }), 'whole sequence');
  const burns: NominalBurn[] = [];
  let last: TrajectoryEvaluation = whole;
  for (let k = 0; k < settings.length; k++) {
    const pre = whole.burns[k].preBurn;
    const fromK = requireOk(await evaluateTrajectory(contextFrom(ctx, pre, plan.burns[k].massBeforeKg), settings.slice(k), { ...opts, withStm: true }), `from burn ${k + 1}`);
    last = fromK;
    burns.push(await nominalBurn(ctx, plan, settings, k, pre, fromK, opts));
  }
  let transitionToFirst = identity(6);
  if (settings[0].epochTdbS > ctx.evaluation.initial.epochTdbS) {
    const seg = await propagateSegment(ctx.problem, ctx.ephemeris, ctx.evaluation.initial, ctx.problem.spacecraft.massKg, settings[0].epochTdbS, { ...opts, withStm: true });
    if (seg.outcome !== 'finished' || !seg.stm) throw new InvalidInputError('problem', `propagation to the first burn ended '${seg.outcome}'`);
    transitionToFirst = rowsOf6(seg.stm);
  }
  const idx = ctx.bPlaneIndex;
  const approach = idx ? whole.approaches.find((a) => a.body === idx.body) : undefined;
  return {
    plan, burns, transitionToFirst, nominalValues: whole.values.slice(),
    deliveryJacobian: (last.initialStateJacobian as number[][]).map((row) => row.slice()),
    ...(burns[burns.length - 1]?.model === 'finite' ? { deliveryBurnJacobian: (last.burnJacobians as number[][][])[0].map((row) => row.slice()) } : {}),
    components: ctx.components.map((c) => ({ name: c.component, unit: c.unit })),
    targetCount: ctx.targetCount,
    bPlane: idx ? {
      body: idx.body, bDotT: idx.bDotT, bDotR: idx.bDotR, closestApproach: idx.closestApproach, bodyRadiusKm: radiusOf(idx.body),
      impactRadiusKm: approachImpactRadiusKm(ctx, whole), gmKm3S2: gmOf(idx.body),
      vInfinityKmS: approach ? vInfinityKmS(approach.stateRelBody, gmOf(idx.body)) : null,
    } : null,
    initialCovariance: ctx.initialCovariance,
    knowledgeCovariances: request.knowledge.map((k) => covarianceBetweenFrames(k.covarianceKmKmS, ctx.problem.initialState.frame, 'J2000_EQUATORIAL')),
  };
}

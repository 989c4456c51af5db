/**
 * Linear dispersion of a converged plan: Gates execution covariance of each burn (inertial Δv) and the
 * initial-state covariance, mapped through the STM-chained sensitivities of the final evaluation to every
 * target component, the B-plane ellipse (1σ and 3σ) and the closest-approach time σ; the impact
 * probability is the Gaussian mass inside the gravity-focused impact disc.
 */
import { bPlaneEllipse, scaledEllipse } from '../dispersion/ellipse.ts';
import { gatesCovarianceKm2S2 } from '../dispersion/gates.ts';
import { impactRadiusKm, probabilityInsideDisc } from '../dispersion/impact-probability.ts';
import { linearTargetCovariance } from '../dispersion/linear-mapping.ts';
import type { Matrix } from '../../propagator/index.ts';
import type { BPlaneEllipse, LinearDispersion } from '../../contract/plan-types.ts';
import type { TrajectoryEvaluation } from '../targeting/evaluate-trajectory.ts';
import { gmOf, radiusOf } from '../targeting/target-components.ts';
import type { PlanningContext } from './planning-context.ts';

type Part = LinearDispersion['total'];

function part(ctx: PlanningContext, c: Matrix): Part {
  const idx = ctx.bPlaneIndex;
  let bPlane: BPlaneEllipse | null = null;
  if (idx) bPlane = bPlaneEllipse([[c[idx.bDotT][idx.bDotT], c[idx.bDotT][idx.bDotR]], [c[idx.bDotR][idx.bDotT], c[idx.bDotR][idx.bDotR]]]);
  return {
    bPlane,
    closestApproachSigmaS: idx ? Math.sqrt(Math.max(0, c[idx.closestApproach][idx.closestApproach])) : null,
    targetSigmas: c.slice(0, ctx.targetCount).map((row, i) => Math.sqrt(Math.max(0, row[i]))),
  };
}

/** Hyperbolic excess speed of an approach state relative to a body (km/s), or null when bound. */
export function vInfinityKmS(stateRelBody: readonly number[], mu: number): number | null {
  const r = Math.hypot(stateRelBody[0], stateRelBody[1], stateRelBody[2]);
  const v2 = stateRelBody[3] ** 2 + stateRelBody[4] ** 2 + stateRelBody[5] ** 2;
  const vinf2 = v2 - (2 * mu) / r;
  return vinf2 > 0 ? Math.sqrt(vinf2) : null;
}

/** Impact radius at the B-plane body for the evaluated approach, km (null without a B-plane target). */
export function approachImpactRadiusKm(ctx: PlanningContext, ev: TrajectoryEvaluation): number | null {
  const idx = ctx.bPlaneIndex;
  if (!idx) return null;
  const a = ev.approaches.find((x) => x.body === idx.body);
  const vinf = a ? vInfinityKmS(a.stateRelBody, gmOf(idx.body)) : null;
  return vinf === null ? null : impactRadiusKm(radiusOf(idx.body), gmOf(idx.body), vinf);
}

/** Linear dispersion from the final (STM) evaluation; null when there is nothing to map. */
export function linearDispersion(ctx: PlanningContext, ev: TrajectoryEvaluation): { linear: LinearDispersion | null; totalCovariance: Matrix | null; notes: string[] } {
  const notes: string[] = [];
  const errors = ctx.problem.executionErrors;
  const cov = ctx.initialCovariance;
  if (!errors && !cov) {
    notes.push('no executionErrors and no initial-state covariance: nothing to disperse');
    return { linear: null, totalCovariance: null, notes };
  }
  if (!ev.burnJacobians || !ev.initialStateJacobian) {
    notes.push('internal: the final evaluation carries no sensitivities');
    return { linear: null, totalCovariance: null, notes };
  }
  const burnJ = ev.burnJacobians;
  const burnInputs = errors
    ? ev.burns.map((b, i) => ({ sensitivity: burnJ[i], covarianceKm2S2: gatesCovarianceKm2S2(b.deltaVInertialKmS, errors) }))
    : [];
  const mapped = linearTargetCovariance(burnInputs, cov ? { sensitivity: ev.initialStateJacobian, covariance: cov } : null);
  const total = part(ctx, mapped.total);
  let impactProbability: number | null = null;
  const idx = ctx.bPlaneIndex;
  const rImpact = approachImpactRadiusKm(ctx, ev);
  if (idx && rImpact !== null) {
    const c = mapped.total;
    impactProbability = probabilityInsideDisc([ev.values[idx.bDotT], ev.values[idx.bDotR]],
      [[c[idx.bDotT][idx.bDotT], c[idx.bDotT][idx.bDotR]], [c[idx.bDotR][idx.bDotT], c[idx.bDotR][idx.bDotR]]], rImpact);
  }
  if (!errors) notes.push('no executionErrors: the execution contribution is zero');
  return {
    linear: {
      execution: part(ctx, mapped.execution),
      initialState: mapped.initialState ? part(ctx, mapped.initialState) : null,
      total,
      threeSigma: total.bPlane ? scaledEllipse(total.bPlane, 3) : null,
      impactProbability,
    },
    totalCovariance: mapped.total,
    notes,
  };
}

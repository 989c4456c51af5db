/**
 * The linear path of the Δv budget: one sample in microseconds from the nominal model (budget-nominal.ts).
 * With δx the true state's deviation from the nominal just before burn k and e_k the navigation error:
 *   commanded Δv_k = Δv_k,nominal − G_k·(δx + e_k); executed = Gates(commanded, drawn normals);
 *   δx ← δx + [0; executed − Δv_k,nominal], then δx ← Φ_k·δx to the next burn;
 *   delivered = nominal values + J_delivery·δx after the last burn.
 * A finite burn (budget-nominal.ts: Δv is its equivalent Δv, δx is at its ignition) carries its Δv change
 * through its arc instead: δx ← Φ_k·δx + Ψ_k·(executed − Δv_k,nominal) (Ψ_k = deltaVToNext), and a finite
 * last burn delivers nominal values + J_delivery·δx + B_delivery·(executed − Δv_nominal). The Gates errors
 * act on the equivalent Δv, as in the plan's linear dispersion of a finite burn.
 * Limits from the delivered B-plane point on the nominal approach hyperbola: impact when |B| is inside the
 * gravity-focused impact radius; periapsis radius r_p = (μ/v∞²)·(sqrt(1 + (|B|·v∞²/μ)²) − 1) (energy and
 * angular momentum of the hyperbola, common practice). Without a B-plane target no altitude is evaluated.
 */
import { executedDeltaV } from '../dispersion/gates.ts';
import { exhaustVelocityKmS } from '../maneuver-math.ts';
import type { BudgetRequest } from '../../contract/budget-schema.ts';
import type { BudgetDraw } from './budget-draws.ts';
import type { BudgetNominal, BudgetSample, SampleBurn } from '../../contract/budget-types.ts';
import { multiplyVector, type Vec3 } from '../../propagator/index.ts';

/** Closest-approach altitude (km) and impact from a B-plane point on the nominal hyperbola. */
export function approachFromBPlane(nominal: BudgetNominal, bDotTKm: number, bDotRKm: number): { altitudeKm: number | null; impact: boolean } {
  const bp = nominal.bPlane;
  if (!bp || bp.vInfinityKmS === null) return { altitudeKm: null, impact: false };
  const b = Math.hypot(bDotTKm, bDotRKm);
  const v2 = bp.vInfinityKmS ** 2;
  const rp = (bp.gmKm3S2 / v2) * (Math.sqrt(1 + ((b * v2) / bp.gmKm3S2) ** 2) - 1);
  return { altitudeKm: rp - bp.bodyRadiusKm, impact: rp < bp.bodyRadiusKm };
}

/** One linear-path sample for its draws; see the file comment. */
export function linearBudgetSample(request: BudgetRequest, nominal: BudgetNominal, draw: BudgetDraw): BudgetSample {
  const errors = request.problem.executionErrors ?? null;
  const exhaust = exhaustVelocityKmS(request.problem.spacecraft.engine.ispS);
  let dx = draw.initialOffset ? multiplyVector(nominal.transitionToFirst, draw.initialOffset) : [0, 0, 0, 0, 0, 0];
  let mass = request.problem.spacecraft.massKg;
  // A finite last burn's Δv change, delivered through its own sensitivity (deliveryBurnJacobian).
  let lastChange: number[] | null = null;
  const burns: SampleBurn[] = nominal.burns.map((b, k) => {
    const estimate = dx.map((v, i) => v + draw.knowledgeOffsets[k][i]);
    const correction = multiplyVector(b.gain, estimate);
    const nom = b.deltaVInertialKmS;
    const commanded: Vec3 = [nom[0] - correction[0], nom[1] - correction[1], nom[2] - correction[2]];
    const executed = errors ? executedDeltaV(commanded, errors, draw.executionNormals[k]) : commanded;
    const change = [0, 1, 2].map((i) => executed[i] - nom[i]);
    const propellantKg = -mass * Math.expm1(-Math.hypot(...executed) / exhaust);
    mass -= propellantKg;
    if (b.model === 'finite') {
      if (b.transitionToNext && b.deltaVToNext) {
        const arc = multiplyVector(b.deltaVToNext, change);
        dx = multiplyVector(b.transitionToNext, dx).map((v, i) => v + arc[i]);
      } else lastChange = change;
      return { commandedKmS: commanded, magnitudeMS: Math.hypot(...commanded) * 1000, propellantKg };
    }
    for (let i = 0; i < 3; i++) dx[3 + i] += change[i];
    if (b.transitionToNext) dx = multiplyVector(b.transitionToNext, dx);
    return { commandedKmS: commanded, magnitudeMS: Math.hypot(...commanded) * 1000, propellantKg };
  });
  const moved = multiplyVector(nominal.deliveryJacobian, dx);
  const fromBurn = lastChange && nominal.deliveryBurnJacobian ? multiplyVector(nominal.deliveryBurnJacobian, lastChange) : null;
  const delivered = nominal.nominalValues.map((v, i) => v + moved[i] + (fromBurn ? fromBurn[i] : 0));
  const bp = nominal.bPlane;
  const approach = bp ? approachFromBPlane(nominal, delivered[bp.bDotT], delivered[bp.bDotR]) : { altitudeKm: null, impact: false };
  return {
    index: draw.index, burns, delivered, closestApproachAltitudeKm: approach.altitudeKm, impact: approach.impact,
    notConvergedAt: null, stopReason: null,
  };
}

/**
 * Targets broken into scalar components (B·T and B·R, each position axis...), each with its requested value,
 * unit and tolerance, and what the evaluator must find for it: a fixed epoch or the closest approach to a
 * body after the last burn.
 */
import { GM_KM3_S2, RADIUS_KM } from '../../propagator/index.ts';
import type { BodyName } from '../../propagator/index.ts';
import type { TargetResult } from '../../contract/plan-types.ts';
import type { ProblemEpochs } from '../problem-checks.ts';
import type { PlanningProblem, ProblemTarget } from '../../contract/problem-schema.ts';

export type ComponentQuantity =
  | { q: 'bdott' | 'bdotr'; body: BodyName; plane: 'ecliptic' | 'equator' }
  | { q: 'ca-epoch'; body: BodyName }
  | { q: 'periapsis-radius' | 'periapsis-altitude'; body: BodyName }
  | { q: 'inclination'; body: BodyName; plane: 'ecliptic' | 'equator' }
  | { q: 'state'; axis: number; centre: BodyName };

export interface TargetComponent {
  targetIndex: number;
  kind: ProblemTarget['kind'];
  component: string;
  unit: TargetResult['unit'];
  body: BodyName | null;
  requested: number;
  tolerance: number;
  quantity: ComponentQuantity;
  /** Where the value is read: at a fixed epoch (TDB s) or at the closest approach to a body. */
  station: { kind: 'epoch'; epochTdbS: number } | { kind: 'approach'; body: BodyName };
}

const AXES = ['x', 'y', 'z', 'vx', 'vy', 'vz'];

/** Scalar components of every target, in targets[] order. */
export function targetComponents(problem: PlanningProblem, epochs: ProblemEpochs): TargetComponent[] {
  const out: TargetComponent[] = [];
  problem.targets.forEach((t, i) => {
    const base = { targetIndex: i, kind: t.kind };
    switch (t.kind) {
      case 'b-plane': {
        const station = { kind: 'approach' as const, body: t.body };
        out.push({ ...base, component: 'B·T', unit: 'km', body: t.body, requested: t.bDotTKm, tolerance: t.toleranceKm, quantity: { q: 'bdott', body: t.body, plane: t.referencePlane }, station });
        out.push({ ...base, component: 'B·R', unit: 'km', body: t.body, requested: t.bDotRKm, tolerance: t.toleranceKm, quantity: { q: 'bdotr', body: t.body, plane: t.referencePlane }, station });
        break;
      }
      case 'closest-approach-epoch':
        out.push({ ...base, component: 'closest-approach epoch', unit: 's', body: t.body, requested: epochs.targetTdbS[i] as number, tolerance: t.toleranceS, quantity: { q: 'ca-epoch', body: t.body }, station: { kind: 'approach', body: t.body } });
        break;
      case 'periapsis-radius':
        out.push({ ...base, component: 'periapsis radius', unit: 'km', body: t.body, requested: t.radiusKm, tolerance: t.toleranceKm, quantity: { q: 'periapsis-radius', body: t.body }, station: { kind: 'approach', body: t.body } });
        break;
      case 'periapsis-altitude':
        out.push({ ...base, component: 'periapsis altitude', unit: 'km', body: t.body, requested: t.altitudeKm, tolerance: t.toleranceKm, quantity: { q: 'periapsis-altitude', body: t.body }, station: { kind: 'approach', body: t.body } });
        break;
      case 'periapsis-inclination':
        out.push({ ...base, component: 'inclination at periapsis', unit: 'deg', body: t.body, requested: t.inclinationDeg, tolerance: t.toleranceDeg, quantity: { q: 'inclination', body: t.body, plane: t.referencePlane }, station: { kind: 'approach', body: t.body } });
        break;
      case 'position':
      case 'state': {
        const values = t.kind === 'state' ? [...t.positionKm, ...t.velocityKmS] : [...t.positionKm];
        values.forEach((v, k) => out.push({
          ...base, component: AXES[k], unit: k < 3 ? 'km' : 'km/s', body: t.centre, requested: v,
          tolerance: k < 3 ? t.toleranceKm : (t.kind === 'state' ? t.velocityToleranceKmS : t.toleranceKm),
          quantity: { q: 'state', axis: k, centre: t.centre },
          station: { kind: 'epoch', epochTdbS: epochs.targetTdbS[i] as number },
        }));
        break;
      }
    }
  });
  return out;
}

/** GM of a body, km^3/s^2. */
export function gmOf(body: BodyName): number {
  return GM_KM3_S2[body];
}

/** Mean/equatorial radius of a body, km. */
export function radiusOf(body: BodyName): number {
  return RADIUS_KM[body];
}

/**
 * Pieces of the plan built from one trajectory evaluation: epochs as text, the burn table (Δv in every
 * frame, propellant by the rocket equation, duration at thrust), targets requested vs achieved, the
 * down-sampled trajectory, and the force-model summary.
 */
import { changeCentre, eclipticFromEquatorialJ2000, formatEpoch, utcTextOrNull } from '../../propagator/index.ts';
import type { Ephemeris, LeapSecondTable, StateVector, Vec3 } from '../../propagator/index.ts';
import { budgetBurns } from '../maneuver-math.ts';
import type { ManeuverPlan, PlanBodyPosition, PlanEpoch, PlannedBurn, TargetResult, TrajectoryPoint } from '../../contract/plan-types.ts';
import type { BodyName } from '../../contract/bodies.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import type { BurnRecord } from '../targeting/evaluate-trajectory.ts';
import type { TargetComponent } from '../targeting/target-components.ts';
import { axesFromInertial, localAxes } from '../../propagator/index.ts';

/** An epoch as TDB seconds and text; UTC through `leapSeconds` (past its expiry with the last TAI − UTC,
 * which the plan's caveat states), null only before the table's first step (1972). */
export function planEpoch(tdbS: number, leapSeconds: LeapSecondTable): PlanEpoch {
  return { tdbS, tdb: formatEpoch(tdbS, 'TDB', 3), utc: utcTextOrNull(tdbS, leapSeconds, 3) };
}

/** Burn table rows from the evaluated burns (J2000 equatorial Δv). `firstTargetTdbS` after each burn. */
export function plannedBurns(problem: PlanningProblem, burns: BurnRecord[], freeEpoch: boolean[],
  targetEpochAfter: (tdbS: number) => number | null, leapSeconds: LeapSecondTable): PlannedBurn[] {
  const budget = budgetBurns(burns.map((b) => Math.hypot(...b.deltaVInertialKmS)), problem.spacecraft.massKg,
    problem.spacecraft.engine.ispS, problem.spacecraft.engine.thrustN);
  return burns.map((b, i) => {
    const r = b.preBurn.positionKm;
    const v = b.preBurn.velocityKmS;
    const dv = b.deltaVInertialKmS;
    const tt = targetEpochAfter(b.epochTdbS);
    return {
      index: i,
      label: problem.burns[i].label ?? `burn ${i + 1}`,
      epoch: planEpoch(b.epochTdbS, leapSeconds),
      epochWasFree: freeEpoch[i],
      frame: problem.burns[i].frame,
      deltaVInertialKmS: [...dv] as Vec3,
      deltaVRtnKmS: axesFromInertial(localAxes('RTN', r, v), dv),
      deltaVVnbKmS: axesFromInertial(localAxes('VNB', r, v), dv),
      magnitudeMS: Math.hypot(...dv) * 1000,
      propellantKg: budget[i].propellantKg,
      massBeforeKg: budget[i].massBeforeKg,
      massAfterKg: budget[i].massAfterKg,
      durationS: budget[i].durationS,
      timeToTargetS: tt === null ? null : tt - b.epochTdbS,
    };
  });
}

/** Requested vs achieved for the target components (auxiliary ones are left out). */
export function targetResults(components: TargetComponent[], targetCount: number, values: (number | null)[],
  leapSeconds: LeapSecondTable): TargetResult[] {
  return components.slice(0, targetCount).map((c, i) => {
    const achieved = values[i];
    const residual = achieved === null ? null : achieved - c.requested;
    const result: TargetResult = {
      targetIndex: c.targetIndex, kind: c.kind, component: c.component, unit: c.unit, body: c.body,
      requested: c.requested, achieved, residual, tolerance: c.tolerance,
      met: residual !== null && Math.abs(residual) <= c.tolerance,
    };
    if (c.quantity.q === 'ca-epoch') {
      result.requestedEpoch = planEpoch(c.requested, leapSeconds);
      result.achievedEpoch = achieved === null ? null : planEpoch(achieved, leapSeconds);
    }
    return result;
  });
}

/** Down-samples states to at most `maxPoints`, central-body relative, J2000 ecliptic. */
export function trajectoryPoints(samples: StateVector[], centre: StateVector['centre'], ephemeris: Ephemeris, maxPoints = 400): TrajectoryPoint[] {
  const sorted = samples.slice().sort((a, b) => a.epochTdbS - b.epochTdbS)
    .filter((s, i, arr) => i === 0 || s.epochTdbS > arr[i - 1].epochTdbS);
  const stride = Math.max(1, Math.ceil(sorted.length / maxPoints));
  const picked = sorted.filter((_, i) => i % stride === 0 || i === sorted.length - 1);
  return picked.map((s) => {
    const c = s.centre === centre ? s : changeCentre(s, centre, ephemeris);
    return {
      tdbS: c.epochTdbS,
      positionKm: eclipticFromEquatorialJ2000(c.positionKm),
      velocityKmS: eclipticFromEquatorialJ2000(c.velocityKmS),
    };
  });
}

/**
 * Where the Sun and the force model's bodies were, for the trajectory figure: each approached body at its
 * closest approach (`approaches`, epochs TDB s from J2000), every other one at `initialTdbS`. Positions relative
 * to `centre`, J2000 ecliptic axes, km. Bodies the ephemeris does not carry, or epochs outside its span, are left
 * out (the figure then has no mark for them; nothing else depends on this list).
 */
export function bodyPositions(
  ephemeris: Ephemeris, centre: BodyName, bodies: readonly BodyName[],
  approaches: readonly { body: BodyName; epochTdbS: number }[], initialTdbS: number, epochOf: (tdbS: number) => PlanEpoch,
): PlanBodyPosition[] {
  const out: PlanBodyPosition[] = [];
  const buf = new Float64Array(3);
  const place = (body: BodyName, tdbS: number, at: PlanBodyPosition['at']): void => {
    if (!ephemeris.bodies.includes(body) || tdbS < ephemeris.span.startTdbS || tdbS > ephemeris.span.endTdbS) return;
    ephemeris.positionInto(body, centre, tdbS, buf);
    out.push({ body, at, epoch: epochOf(tdbS), positionKm: eclipticFromEquatorialJ2000(buf) });
  };
  for (const a of approaches) place(a.body, a.epochTdbS, 'closest-approach');
  for (const body of new Set<BodyName>(['sun', ...bodies])) {
    if (body !== centre && !approaches.some((a) => a.body === body)) place(body, initialTdbS, 'initial');
  }
  return out;
}

/** One-line force-model summary and its fields. */
export function forceModelSummary(problem: PlanningProblem, ephemerisName: string): ManeuverPlan['forceModel'] {
  const fm = problem.forceModel;
  const parts = [`${fm.centralBody} point mass${fm.centralJ2 ? ' + J2' : ''}`];
  if (fm.perturbingBodies.length > 0) parts.push(`third bodies ${fm.perturbingBodies.join(', ')} (Battin f(q))`);
  if (fm.solarPressure) parts.push('cannonball SRP');
  parts.push(`${fm.method === 'encke' ? 'Encke' : 'Cowell'}, DOP853, relative tolerance ${fm.relativeTolerance}`);
  if (fm.switching) parts.push('central-body switching on');
  return {
    summary: parts.join('; '), centralBody: fm.centralBody, perturbingBodies: [...fm.perturbingBodies],
    centralJ2: fm.centralJ2, solarPressure: fm.solarPressure, method: fm.method,
    relativeTolerance: fm.relativeTolerance, switching: fm.switching, ephemeris: ephemerisName,
  };
}

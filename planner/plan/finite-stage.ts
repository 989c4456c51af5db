/**
 * The finite-burn stage of planning: seeds from the converged impulsive solution (a burn centred on the
 * impulsive epoch, duration from the rocket equation at the engine's thrust), and the plan's finite-burn
 * details — everything needed to fly it again (ignition, duration, thrust, mass flow, direction), the
 * masses, the finite-burn loss against the impulsive Δv, and what happens inside the arc (a closest
 * approach to a planned body, a sphere-of-influence crossing) so that a caveat can flag it.
 * Units: km, s, km/s, kg, N; J2000 equatorial; epochs TDB s from J2000.
 */
import { changeCentre, PRIMARY_OF, soiRadiusKm } from '../../propagator/index.ts';
import type { BodyName, Ephemeris, LeapSecondTable, StateVector, Vec3 } from '../../propagator/index.ts';
import type { PlannedBurn } from '../../contract/plan-types.ts';
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import { budgetBurns, exhaustVelocityKmS, massFlowRateKgS } from '../maneuver-math.ts';
import type { BurnSetting } from '../targeting/controls.ts';
import type { BurnRecord } from '../targeting/evaluate-trajectory.ts';
import { acrossOf } from '../targeting/finite-controls.ts';
import type { FiniteSeed } from '../targeting/finite-types.ts';
import { planEpoch } from './plan-parts.ts';

/** True when the problem asks for any finite burn. */
export function hasFiniteBurns(problem: PlanningProblem): boolean {
  return problem.burns.some((b) => b.model === 'finite');
}

/**
 * Seeds of the finite burns from the impulsive solution's burns (Δv in each burn's frame); undefined for
 * impulsive burns. Throws when a finite burn's impulsive Δv is zero (no direction to start from).
 */
export function finiteSeeds(problem: PlanningProblem, impulsive: BurnRecord[]): { seeds: (FiniteSeed | undefined)[]; error: string | null } {
  const { ispS, thrustN } = problem.spacecraft.engine;
  const budget = budgetBurns(impulsive.map((b) => Math.hypot(...b.deltaVInertialKmS)), problem.spacecraft.massKg, ispS, thrustN);
  const massFlowKgS = massFlowRateKgS(thrustN, ispS);
  let error: string | null = null;
  const seeds = problem.burns.map((b, i): FiniteSeed | undefined => {
    if (b.model !== 'finite') return undefined;
    const dv = impulsive[i].deltaVLocalKmS;
    const mag = Math.hypot(...dv);
    if (!(mag > 0)) {
      error ??= `burn ${i + 1}: the impulsive solution has zero Δv, so there is no direction to start the finite burn from`;
      return undefined;
    }
    const direction: Vec3 = [dv[0] / mag, dv[1] / mag, dv[2] / mag];
    const durationS = budget[i].durationS;
    return {
      direction, across: acrossOf(direction), startTdbS: impulsive[i].epochTdbS - durationS / 2, durationS, thrustN, massFlowKgS,
      impulsiveDeltaVKmS: mag,
    };
  });
  return { seeds, error };
}

/** Bodies whose closest approach or sphere of influence an arc may touch: the planned bodies. */
function arcBodies(problem: PlanningProblem): BodyName[] {
  const fm = problem.forceModel;
  return [...new Set<BodyName>([...fm.perturbingBodies, ...problem.targets.flatMap((t) => ('body' in t ? [t.body] : []))])]
    .filter((b) => b !== fm.centralBody);
}

/** What happens inside a burn arc: closest approaches (range rate turns from − to +) and SOI crossings. */
function insideArc(problem: PlanningProblem, ephemeris: Ephemeris, start: StateVector, end: StateVector): string[] {
  const notes: string[] = [];
  for (const body of arcBodies(problem)) {
    const a = changeCentre(start, body, ephemeris);
    const b = changeCentre(end, body, ephemeris);
    const rate = (s: StateVector): number => (s.positionKm[0] * s.velocityKmS[0] + s.positionKm[1] * s.velocityKmS[1] + s.positionKm[2] * s.velocityKmS[2]) / Math.hypot(...s.positionKm);
    const [ra, rb] = [rate(a), rate(b)];
    if (ra < 0 && rb > 0) {
      notes.push(`closest approach to ${body} inside the burn (range rate ${ra.toFixed(4)} km/s at ignition, +${rb.toFixed(4)} km/s at cut-off)`);
    }
    if (PRIMARY_OF[body] === problem.forceModel.centralBody || PRIMARY_OF[problem.forceModel.centralBody] === body) {
      const radius = soiRadiusKm(body);
      const [da, db] = [Math.hypot(...a.positionKm), Math.hypot(...b.positionKm)];
      if ((da - radius) * (db - radius) < 0) {
        notes.push(`crosses the sphere of influence of ${body} (radius ${radius.toFixed(0)} km) during the burn: ${da.toFixed(0)} km at ignition, ${db.toFixed(0)} km at cut-off`);
      }
    }
  }
  return notes;
}

/** Adds model 'finite' and the finite details to the plan rows of finite burns. */
export function attachFiniteDetails(problem: PlanningProblem, rows: PlannedBurn[], flown: BurnRecord[], seeds: (FiniteSeed | undefined)[],
  ephemeris: Ephemeris, leapSeconds: LeapSecondTable): void {
  rows.forEach((row, i) => {
    const f = flown[i]?.finite;
    const seed = seeds[i];
    if (f === undefined || seed === undefined) {
      row.model = 'impulsive';
      return;
    }
    const r = f.record;
    const idealDeltaVMS = r.idealDeltaVKmS * 1000;
    row.model = 'finite';
    row.finite = {
      startTdbS: r.startTdbS, durationS: f.spec.durationS, thrustN: f.spec.thrustN, massFlowKgS: f.spec.massFlowKgS,
      directionInertial: r.directionAtStartInertial, axes: f.spec.axes, directionLocal: [...f.spec.direction] as Vec3,
      directionAtEndInertial: r.directionAtEndInertial, axesAtStart: flown[i].axes.map((a) => [...a] as Vec3) as [Vec3, Vec3, Vec3], start: planEpoch(r.startTdbS, leapSeconds), end: planEpoch(r.endTdbS, leapSeconds),
      propellantKg: r.massBeforeKg - r.massAfterKg, massBeforeKg: r.massBeforeKg, massAfterKg: r.massAfterKg,
      idealDeltaVMS, impulsiveDeltaVMS: seed.impulsiveDeltaVKmS * 1000, finiteBurnLossMS: idealDeltaVMS - seed.impulsiveDeltaVKmS * 1000,
      insideArc: insideArc(problem, ephemeris, r.stateAtStart, r.stateAtEnd),
    };
    // The row's own numbers follow the finite burn as flown.
    row.propellantKg = row.finite.propellantKg;
    row.massBeforeKg = r.massBeforeKg;
    row.massAfterKg = r.massAfterKg;
    row.durationS = f.spec.durationS;
  });
}

/** What flying a planned finite burn again needs (the plan's finite block, or the budget's re-plan). */
export type FiniteFlight = Pick<NonNullable<PlannedBurn['finite']>, 'startTdbS' | 'thrustN' | 'massFlowKgS' | 'massBeforeKg' | 'axes' | 'axesAtStart'>;

/**
 * A planned burn flown with an execution error (Monte Carlo): impulsive burns take the dispersed Δv
 * (J2000 equatorial) as is; a finite burn goes through {@link finiteSettingFor}.
 */
export function dispersedSetting(row: PlannedBurn, appliedDeltaVKmS: Vec3, ispS: number): BurnSetting {
  const f = row.finite;
  if (row.model !== 'finite' || f === undefined) return { epochTdbS: row.epoch.tdbS, frame: 'inertial', deltaVLocalKmS: appliedDeltaVKmS };
  return finiteSettingFor(f, appliedDeltaVKmS, ispS);
}

/**
 * A finite burn that delivers the equivalent Δv `appliedDeltaVKmS` (J2000 equatorial, km/s): a duration by
 * the rocket equation from the mass before, D = m0·(1 − exp(−|Δv|/v_e))/ṁ (a magnitude error is a
 * thrust-time error), and a direction in the burn's axes at ignition `axesAtStart` (a pointing error) — the
 * same mapping the linear dispersion uses to first order. Ignition at `startTdbS` (TDB s), ispS in s.
 */
export function finiteSettingFor(f: FiniteFlight, appliedDeltaVKmS: Vec3, ispS: number): BurnSetting {
  const mag = Math.hypot(...appliedDeltaVKmS);
  const durationS = (f.massBeforeKg * -Math.expm1(-mag / exhaustVelocityKmS(ispS))) / f.massFlowKgS;
  const local = f.axesAtStart.map((a) => (a[0] * appliedDeltaVKmS[0] + a[1] * appliedDeltaVKmS[1] + a[2] * appliedDeltaVKmS[2]) / mag) as Vec3;
  return {
    epochTdbS: f.startTdbS, frame: f.axes, deltaVLocalKmS: [0, 0, 0],
    finite: { startTdbS: f.startTdbS, durationS, thrustN: f.thrustN, massFlowKgS: f.massFlowKgS, directionLocal: local, directionPartials: [[0, 0, 0], [0, 0, 0]] },
  };
}

/** A two-body Earth plan and its independent truth, shared by the CCSDS export tests. */
import { problemSchema, type ManeuverPlan, type PlanningProblem } from '../../planner/index.ts';
import { inertialToLocal, parseEpoch, type Vec3 } from '../../propagator/index.ts';

/**
 * Independent two-body truth: Kepler's problem in universal variables with Stumpff functions
 * (Curtis, Orbital Mechanics for Engineering Students, Algorithms 3.3 and 3.4), written here
 * without the project's propagator.
 */
export const MU = 398600.435507; // Earth GM, km³/s² (DE440, as in propagator/constants.ts; Park et al. 2021)

function stumpffC(z: number): number {
  if (z > 0) return (1 - Math.cos(Math.sqrt(z))) / z;
  if (z < 0) return (Math.cosh(Math.sqrt(-z)) - 1) / -z;
  return 0.5;
}
function stumpffS(z: number): number {
  if (z > 0) return (Math.sqrt(z) - Math.sin(Math.sqrt(z))) / Math.sqrt(z) ** 3;
  if (z < 0) return (Math.sinh(Math.sqrt(-z)) - Math.sqrt(-z)) / Math.sqrt(-z) ** 3;
  return 1 / 6;
}
const dot = (a: readonly number[], b: readonly number[]): number => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
export const norm = (a: readonly number[]): number => Math.sqrt(dot(a, a));

export function kepler(r0: readonly number[], v0: readonly number[], dt: number): { r: Vec3; v: Vec3 } {
  const r0n = norm(r0);
  const vr0 = dot(r0, v0) / r0n;
  const alpha = 2 / r0n - dot(v0, v0) / MU;
  let x = Math.sqrt(MU) * Math.abs(alpha) * dt;
  for (let i = 0; i < 100; i++) {
    const z = alpha * x * x;
    const f = r0n * vr0 / Math.sqrt(MU) * x * x * stumpffC(z) + (1 - alpha * r0n) * x ** 3 * stumpffS(z) + r0n * x - Math.sqrt(MU) * dt;
    const df = r0n * vr0 / Math.sqrt(MU) * x * (1 - alpha * x * x * stumpffS(z)) + (1 - alpha * r0n) * x * x * stumpffC(z) + r0n;
    const step = f / df;
    x -= step;
    if (Math.abs(step) < 1e-13 * Math.max(1, Math.abs(x))) break;
  }
  const z = alpha * x * x;
  const f = 1 - x * x / r0n * stumpffC(z);
  const g = dt - x ** 3 / Math.sqrt(MU) * stumpffS(z);
  const r: Vec3 = [0, 1, 2].map((k) => f * r0[k] + g * v0[k]) as Vec3;
  const rn = norm(r);
  const fdot = Math.sqrt(MU) / (rn * r0n) * (alpha * x ** 3 * stumpffS(z) - x);
  const gdot = 1 - x * x / rn * stumpffC(z);
  return { r, v: [0, 1, 2].map((k) => fdot * r0[k] + gdot * v0[k]) as Vec3 };
}

// Invented small satellite in a two-body Earth orbit (the shape of examples/two-body-demo.json).
export const P0: Vec3 = [6978.137, 0, 0];
export const V0: Vec3 = [0, 6.641981226263, 3.606301563691];
export const problem: PlanningProblem = problemSchema.parse({
  title: 'Wren (invented): export check',
  spacecraft: { name: 'Wren', massKg: 180, engine: { ispS: 215, thrustN: 220 } },
  initialState: {
    epoch: '2030-04-01T00:00:00 TDB', centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: P0, velocityKmS: V0,
    covarianceKmKmS: [
      [1e-2, 2e-3, 0, 0, 1e-6, 0], [2e-3, 4e-2, 0, -2e-6, 0, 0], [0, 0, 9e-3, 0, 0, 3e-7],
      [0, -2e-6, 0, 1e-9, 0, 0], [1e-6, 0, 0, 0, 4e-9, 0], [0, 0, 3e-7, 0, 0, 2e-9],
    ],
  },
  endEpoch: '2030-04-01T01:05:00 TDB',
  forceModel: { centralBody: 'earth', perturbingBodies: [], relativeTolerance: 1e-12 },
  burns: [{ label: 'RAISE-1', epoch: '2030-04-01T00:10:00 TDB', frame: 'VNB', deltaVGuessKmS: [0.02, 0, 0] }],
  targets: [{ kind: 'position', epoch: '2030-04-01T00:55:00 TDB', centre: 'earth', positionKm: [0, 7000, 0], toleranceKm: 1 }],
});

export const BURN_TDB = parseEpoch('2030-04-01T00:10:00 TDB');
export const START_TDB = parseEpoch(problem.initialState.epoch);
export const PRE_BURN = kepler(P0, V0, BURN_TDB - START_TDB);
export const DV_INERTIAL: Vec3 = [0.0123, -0.0041, 0.0022];

/** Only the fields the exporters read are filled; the Δv's local components come from the propagator's
 * own frame helpers at the (independently computed) pre-burn state. */
export function plan(status: 'converged' | 'not-converged', crossCheckPassed = true): ManeuverPlan {
  return {
    planFormatVersion: 1, status, problemHash: 'a'.repeat(64), softwareVersion: '0.1.0', spacecraftName: 'Wren',
    targetSetKey: 'wren', title: problem.title ?? null,
    burns: [{
      index: 0, label: 'RAISE-1', epoch: { tdbS: BURN_TDB, tdb: '2030-04-01T00:10:00.000 TDB', utc: null }, epochWasFree: false,
      frame: 'VNB', deltaVInertialKmS: DV_INERTIAL,
      deltaVRtnKmS: inertialToLocal(DV_INERTIAL, 'RTN', PRE_BURN.r, PRE_BURN.v),
      deltaVVnbKmS: inertialToLocal(DV_INERTIAL, 'VNB', PRE_BURN.r, PRE_BURN.v),
      magnitudeMS: norm(DV_INERTIAL) * 1000, propellantKg: 1.21, massBeforeKg: 180, massAfterKg: 178.79, durationS: 11.5,
      timeToTargetS: 2700,
    }],
    crossCheck: crossCheckPassed ? { passed: true, message: 'agrees' }
      : { passed: false, message: 'encke and cowell differ by 3.2 km at target 1' },
    caveats: [{ code: 'PROPOSAL_REQUIRES_REVIEW', severity: 'critical', text: 'Proposed plan — requires review.' }],
  } as unknown as ManeuverPlan;
}

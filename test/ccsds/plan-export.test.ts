import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  compareWithReference, exportPlanAsCcsds, oemToTrajectory, planToOem, readOem, readOpm, REVIEW_COMMENTS,
} from '../../ccsds/index.ts';
import { problemSchema, type ManeuverPlan, type PlanningProblem } from '../../planner/index.ts';
import {
  inertialToLocal, InvalidInputError, parseEpoch, type Vec3,
} from '../../propagator/index.ts';

/**
 * Independent two-body truth: Kepler's problem in universal variables with Stumpff functions
 * (Curtis, Orbital Mechanics for Engineering Students, Algorithms 3.3 and 3.4), written here
 * without the project's propagator.
 */
const MU = 398600.435507; // Earth GM, km³/s² (DE440, as in propagator/constants.ts; Park et al. 2021)

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
const norm = (a: readonly number[]): number => Math.sqrt(dot(a, a));

function kepler(r0: readonly number[], v0: readonly number[], dt: number): { r: Vec3; v: Vec3 } {
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
const P0: Vec3 = [6978.137, 0, 0];
const V0: Vec3 = [0, 6.641981226263, 3.606301563691];
const problem: PlanningProblem = problemSchema.parse({
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

const BURN_TDB = parseEpoch('2030-04-01T00:10:00 TDB');
const START_TDB = parseEpoch(problem.initialState.epoch);
const PRE_BURN = kepler(P0, V0, BURN_TDB - START_TDB);
const DV_INERTIAL: Vec3 = [0.0123, -0.0041, 0.0022];

/** Only the fields the exporters read are filled; the Δv's local components come from the propagator's
 * own frame helpers at the (independently computed) pre-burn state. */
function plan(status: 'converged' | 'not-converged', crossCheckPassed = true): ManeuverPlan {
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

/** J2000 equatorial → J2000 mean ecliptic with astronomy-engine's own rotation (EQJ → ECL), an outside check
 * on the project's frame code. */
function eclipticByAstronomyEngine(v: readonly number[]): Vec3 {
  const r = Astronomy.RotateVector(Astronomy.Rotation_EQJ_ECL(), new Astronomy.Vector(v[0], v[1], v[2], Astronomy.MakeTime(0)));
  return [r.x, r.y, r.z];
}

/** The same problem with its initial state (and covariance) given in J2000 ecliptic axes. */
function eclipticProblem(): PlanningProblem {
  const c = problem.initialState.covarianceKmKmS!;
  // C_ecl = B C Bᵀ, B = diag(R, R): rotate every column, then every row.
  const rotate6 = (x: readonly number[]): number[] => [...eclipticByAstronomyEngine(x.slice(0, 3)), ...eclipticByAstronomyEngine(x.slice(3))];
  const columns = c.map((row) => rotate6(row));
  const cEcl = Array.from({ length: 6 }, (_, j) => rotate6(columns.map((row) => row[j])));
  return problemSchema.parse({
    ...problem,
    initialState: {
      ...problem.initialState, frame: 'J2000_ECLIPTIC', positionKm: eclipticByAstronomyEngine(P0), velocityKmS: eclipticByAstronomyEngine(V0),
      covarianceKmKmS: cEcl,
    },
  });
}

describe('CCSDS export of a plan', () => {
  describe('when the problem\'s initial state is in J2000 ecliptic axes', () => {
    // CCSDS 502.0-B's frame table has no J2000 ecliptic frame (from memory): the messages say EME2000 and
    // hold the state rotated back — it must equal the equatorial state the ecliptic one was made from.
    it('should write the OPM state and covariance in EME2000', async () => {
      const opm = readOpm(await exportPlanAsCcsds(eclipticProblem(), plan('converged'), { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00' }));
      expect(opm.metadata).toMatchObject({ refFrame: 'EME2000', frame: 'J2000_EQUATORIAL' });
      // Printed to 1e-6 km / 1e-9 km/s (the writer's defaults); the rotations agree far below that.
      opm.state.positionKm.forEach((x, i) => expect(Math.abs(x - P0[i])).toBeLessThan(1e-6));
      opm.state.velocityKmS.forEach((x, i) => expect(Math.abs(x - V0[i])).toBeLessThan(1e-9));
      const c0 = problem.initialState.covarianceKmKmS!;
      opm.covariance!.matrix.forEach((row, i) => row.forEach((x, j) => {
        expect(Math.abs(x - c0[i][j]), `[${i}][${j}]`).toBeLessThan(1e-9 * Math.sqrt(c0[i][i] * c0[j][j]));
      }));
      expect(opm.state.comments.join(' ')).toMatch(/Rotated from the problem's J2000_ECLIPTIC axes to EME2000/);
    });

    it('should write the OEM in EME2000, matching the independent Kepler solution in equatorial axes', async () => {
      const oem = readOem(await exportPlanAsCcsds(eclipticProblem(), plan('converged'), { kind: 'oem', creationDateUtc: '2029-12-01T10:00:00', stepS: 600 }));
      expect(oem.segments.map((s) => s.metadata.refFrame)).toEqual(['EME2000', 'EME2000']);
      expect(oem.segments[0].covariances.map((c) => c.covRefFrame)).toEqual(['EME2000', 'EME2000']);
      const first = oem.segments[0].states[0];
      first.positionKm.forEach((x, i) => expect(Math.abs(x - P0[i])).toBeLessThan(1e-6));
      const end = oem.segments[0].states.at(-1)!;
      end.positionKm.forEach((x, i) => expect(Math.abs(x - PRE_BURN.r[i])).toBeLessThan(1e-5));
    });
  });


  describe('when a converged plan is written as an OPM', () => {
    it('should carry the initial state, the covariance, the mass and one maneuver per burn', async () => {
      const text = await exportPlanAsCcsds(problem, plan('converged'), { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00Z' });
      const opm = readOpm(text);
      expect(opm.header.comments.slice(0, 3)).toEqual([...REVIEW_COMMENTS]);
      expect(opm.header.comments.join(' ')).toMatch(/CRITICAL PROPOSAL_REQUIRES_REVIEW: Proposed plan - requires review/);
      expect(opm.metadata).toMatchObject({ objectName: 'Wren', centerName: 'EARTH', refFrame: 'EME2000', timeSystem: 'TDB' });
      expect(opm.state.epochTdbS).toBe(START_TDB);
      expect(opm.state.positionKm).toEqual(P0);
      expect(opm.covariance?.matrix).toEqual(problem.initialState.covarianceKmKmS);
      expect(opm.spacecraft?.massKg).toBe(180);
      expect(opm.maneuvers).toHaveLength(1);
      const m = opm.maneuvers[0];
      expect(m).toMatchObject({ manRefFrame: 'RTN', durationS: 0, deltaMassKg: -1.21, epochIgnitionTdbS: BURN_TDB });
      // The RTN components written are those of the inertial Δv at the pre-burn state (9 decimals).
      const rtn = inertialToLocal(DV_INERTIAL, 'RTN', PRE_BURN.r, PRE_BURN.v);
      m.deltaVKmS.forEach((x, i) => expect(Math.abs(x - rtn[i])).toBeLessThanOrEqual(0.5e-9 + 1e-15));
      expect(m.comments[0]).toMatch(/RAISE-1: .* m\/s, impulsive as planned; .* about 11.5 s/);
    });

    it('should write TNW components that are the VNB ones permuted, and inertial ones on request', async () => {
      const tnw = readOpm(await exportPlanAsCcsds(problem, plan('converged'), { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00', maneuverFrame: 'TNW' }));
      const vnb = plan('converged').burns[0].deltaVVnbKmS;
      const [t, n, w] = tnw.maneuvers[0].deltaVKmS;
      expect(Math.abs(t - vnb[0]) + Math.abs(-n - vnb[2]) + Math.abs(w - vnb[1])).toBeLessThan(2e-9);
      const inertial = readOpm(await exportPlanAsCcsds(problem, plan('converged'), { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00', maneuverFrame: 'inertial', encoding: 'xml' }));
      expect(inertial.maneuvers[0]).toMatchObject({ manRefFrame: 'EME2000', deltaVKmS: DV_INERTIAL });
    });

    it('should refuse a plan that did not converge', async () => {
      await expect(exportPlanAsCcsds(problem, plan('not-converged'), { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00' }))
        .rejects.toThrow(InvalidInputError);
    });

    it('should refuse a converged plan whose cross-check failed, saying why', async () => {
      // Project safety rule: an unchecked result is never presented as a plan.
      const refused = exportPlanAsCcsds(problem, plan('converged', false), { kind: 'opm', creationDateUtc: '2029-12-01T10:00:00' });
      await expect(refused).rejects.toThrow(InvalidInputError);
      await expect(refused).rejects.toMatchObject({ field: 'plan.crossCheck' });
      await expect(refused).rejects.toThrow(/cross-check did not pass \(encke and cowell differ by 3\.2 km at target 1\)/);
    });
  });

  describe('when the predicted trajectory is written as an OEM', () => {
    const oemPromise = (async () => readOem(await exportPlanAsCcsds(problem, plan('converged'), {
      kind: 'oem', creationDateUtc: '2029-12-01T10:00:00', stepS: 120,
    })))();

    it('should split the trajectory at the burn into two segments at the step', async () => {
      const oem = await oemPromise;
      expect(oem.segments).toHaveLength(2);
      const [a, b] = oem.segments;
      expect(a.states[0].epochTdbS).toBe(START_TDB);
      expect(a.states[a.states.length - 1].epochTdbS).toBe(BURN_TDB);
      expect(b.states[0].epochTdbS).toBe(BURN_TDB);
      expect(b.states[b.states.length - 1].epochTdbS).toBe(parseEpoch(problem.endEpoch));
      expect(a.states[1].epochTdbS - a.states[0].epochTdbS).toBe(120);
      expect(a.metadata).toMatchObject({ interpolation: 'HERMITE', interpolationDegree: 7, refFrame: 'EME2000' });
    });

    it('should match the independent Kepler solution before and after the burn', async () => {
      const oem = await oemPromise;
      const post = { r: PRE_BURN.r, v: PRE_BURN.v.map((x, i) => x + DV_INERTIAL[i]) };
      let worstKm = 0;
      for (const [k, seg] of oem.segments.entries()) {
        for (const s of seg.states) {
          const truth = k === 0 ? kepler(P0, V0, s.epochTdbS - START_TDB) : kepler(post.r, post.v, s.epochTdbS - BURN_TDB);
          for (let c = 0; c < 3; c++) worstKm = Math.max(worstKm, Math.abs(s.positionKm[c] - truth.r[c]));
        }
      }
      // Printed to 1 mm; DOP853 at relative tolerance 1e-12 over an hour stays well inside 1 cm (observed ~1e-6 km).
      expect(worstKm).toBeLessThan(1e-5);
    });

    it('should map the initial covariance with the state transition matrix of the two-body flow', async () => {
      const oem = await oemPromise;
      const [first, mapped] = oem.segments[0].covariances;
      expect(first.epochTdbS).toBe(START_TDB);
      expect(first.matrix[1][1]).toBeCloseTo(4e-2, 12);
      expect(mapped.epochTdbS).toBe(BURN_TDB);
      expect(mapped.comments[0]).toMatch(/execution errors not included/);
      // Φ by central differences of the independent Kepler solution, then Φ P0 Φᵀ.
      const dt = BURN_TDB - START_TDB;
      const x0 = [...P0, ...V0];
      const phi = Array.from({ length: 6 }, () => new Array<number>(6).fill(0));
      for (let j = 0; j < 6; j++) {
        const h = j < 3 ? 1e-3 : 1e-6;
        const plus = [...x0]; plus[j] += h;
        const minus = [...x0]; minus[j] -= h;
        const a = kepler(plus.slice(0, 3), plus.slice(3), dt);
        const b = kepler(minus.slice(0, 3), minus.slice(3), dt);
        [...a.r, ...a.v].forEach((v, i) => { phi[i][j] = (v - [...b.r, ...b.v][i]) / (2 * h); });
      }
      const p0 = problem.initialState.covarianceKmKmS!;
      const expected = phi.map((row) => phi.map((col) => row.reduce((s, v, k) => s + v * col.reduce((t, w, l) => t + p0[k][l] * w, 0), 0)));
      for (let i = 0; i < 6; i++) {
        for (let j = 0; j < 6; j++) {
          const scale = Math.sqrt(expected[i][i] * expected[j][j]);
          expect(Math.abs(mapped.matrix[i][j] - expected[i][j]) / scale, `[${i}][${j}]`).toBeLessThan(1e-6);
        }
      }
    });

    it('should serve as a reference trajectory that independent states can be compared with', async () => {
      const reference = oemToTrajectory(await oemPromise);
      const post = { r: PRE_BURN.r, v: PRE_BURN.v.map((x, i) => x + DV_INERTIAL[i]) };
      const epochs = [START_TDB - 60, START_TDB + 301, BURN_TDB + 1234.5, parseEpoch(problem.endEpoch) - 7];
      const states = epochs.map((t) => {
        const k = t < BURN_TDB ? kepler(P0, V0, t - START_TDB) : kepler(post.r, post.v, t - BURN_TDB);
        return { epochTdbS: t, centre: 'earth' as const, frame: 'J2000_EQUATORIAL' as const, positionKm: k.r, velocityKmS: k.v };
      });
      const same = compareWithReference(states, reference);
      expect([same.compared, same.outsideSpan]).toEqual([3, 1]);
      // Hermite degree 7 over 120 s lines of a 7000 km orbit: interpolation far below the 1 mm printing.
      expect(same.maxPositionDifferenceKm!).toBeLessThan(1e-5);
      const shifted = compareWithReference(states.map((x) => ({ ...x, positionKm: [x.positionKm[0] + 1, x.positionKm[1], x.positionKm[2]] as Vec3 })), reference);
      expect(shifted.maxPositionDifferenceKm!).toBeCloseTo(1, 4);
    });

    it('should refuse a converged plan whose cross-check failed (and one that did not converge)', async () => {
      const options = { kind: 'oem' as const, creationDateUtc: '2029-12-01T10:00:00', stepS: 120 };
      await expect(exportPlanAsCcsds(problem, plan('converged', false), options)).rejects.toMatchObject({
        name: 'InvalidInputError', field: 'plan.crossCheck', message: expect.stringMatching(/cross-check did not pass/),
      });
      await expect(planToOem(problem, plan('not-converged'), options)).rejects.toMatchObject({ field: 'plan.status' });
    });

    it('should refuse a step that would write too many lines', async () => {
      await expect(planToOem(problem, plan('converged'), { creationDateUtc: '2029-12-01T10:00:00', stepS: 1e-3 }))
        .rejects.toThrow(/choose a larger step/);
    });
  });
});

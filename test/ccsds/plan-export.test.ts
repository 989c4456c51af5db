import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  compareWithReference, exportPlanAsCcsds, oemToTrajectory, planToOem, readOem, readOpm, REVIEW_COMMENTS,
} from '../../ccsds/index.ts';
import { problemSchema, type PlanningProblem } from '../../planner/index.ts';
import { inertialToLocal, InvalidInputError, parseEpoch, type Vec3 } from '../../propagator/index.ts';
import {
  BURN_TDB, DV_INERTIAL, kepler, P0, plan, PRE_BURN, problem, START_TDB, V0,
} from './plan-fixture.ts';

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
      // The mapped covariance is the one the equatorial problem gives (same physics, other input axes).
      const equatorial = readOem(await exportPlanAsCcsds(problem, plan('converged'), { kind: 'oem', creationDateUtc: '2029-12-01T10:00:00', stepS: 600 }));
      const [m, e] = [oem.segments[0].covariances[1].matrix, equatorial.segments[0].covariances[1].matrix];
      m.forEach((row, i) => row.forEach((x, j) => expect(Math.abs(x - e[i][j]), `[${i}][${j}]`).toBeLessThan(1e-9 * Math.sqrt(e[i][i] * e[j][j]))));
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

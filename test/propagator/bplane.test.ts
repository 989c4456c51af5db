import { describe, expect, it } from 'vitest';
import {
  B_PLANE_PARTIAL_ROWS, bPlaneOfEncounter, bPlanePartials, computeBPlane, referencePole,
} from '../../propagator/bplane/index.ts';
import { GM_KM3_S2 } from '../../propagator/constants.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import { createBuiltinEphemeris, propagate, type Vec3 } from '../../propagator/index.ts';
import { flybyEphemeris, flybyStart, forcesAbout, PERIAPSIS_EPOCH, PERIAPSIS_RADIUS_KM } from './flyby-fixture.ts';

const MU = GM_KM3_S2.earth;
// An invented hyperbolic approach to Earth, 400 000 km out, v∞ ≈ 3.6 km/s.
const APPROACH = [-250000, 300000, 40000, 2.1, -2.9, -0.6];

describe('B-plane partials', () => {
  describe('when compared with central finite differences', () => {
    for (const plane of ['ecliptic', 'equator'] as const) {
      it(`should agree to 1e-6 relative in every row (${plane} reference)`, () => {
        const { rows } = bPlanePartials(APPROACH, MU, plane, 'earth');
        for (const name of B_PLANE_PARTIAL_ROWS) {
          const norm = Math.hypot(...rows[name].map((d, j) => d * (j < 3 ? 1000 : 1e-3)));
          for (let j = 0; j < 6; j++) {
            const h = j < 3 ? 1 : 1e-6; // km, km/s
            const p = [...APPROACH]; p[j] += h;
            const m = [...APPROACH]; m[j] -= h;
            const a = computeBPlane(p, MU, plane, 'earth')[name];
            const b = computeBPlane(m, MU, plane, 'earth')[name];
            const fd = (a - b) / (2 * h);
            const w = j < 3 ? 1000 : 1e-3; // compare on a common scale: per 1000 km and per 1 m/s
            expect(Math.abs(fd - rows[name][j]) * w / norm, `${name} / x${j}`).toBeLessThan(1e-6);
          }
        }
      });
    }
  });

  describe('when only the values are asked for (computeBPlane)', () => {
    it('should give the values of bPlanePartials to the last bit, for many approaches and both planes', () => {
      // Approaches spread around APPROACH by an irrational step (common practice); the reference is the
      // partials' own value record, computed with derivatives.
      for (let k = 0; k < 50; k++) {
        const f = (k * 0.6180339887498949) % 1;
        const state = APPROACH.map((x, j) => x * (1 + 0.3 * Math.sin(7 * f + j)));
        for (const plane of ['ecliptic', 'equator'] as const) {
          expect(computeBPlane(state, MU, plane, 'earth')).toStrictEqual(bPlanePartials(state, MU, plane, 'earth').value);
        }
      }
      expect(() => computeBPlane([7000, 0, 0, 0, 7.5, 0], MU)).toThrow(InvalidInputError);
    });
  });

  describe('when the reference plane is an equator', () => {
    it('should put T in that equator (T·pole = 0) and keep S, T, R orthonormal', () => {
      for (const body of ['earth', 'mars', 'jupiter'] as const) {
        const bp = computeBPlane(APPROACH, MU, 'equator', body);
        const k = referencePole('equator', body);
        const d = (a: number[], b: number[]) => a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
        expect(Math.abs(d(bp.tHat, k))).toBeLessThan(4e-15);
        expect(Math.abs(d(bp.sHat, bp.tHat))).toBeLessThan(4e-15);
        expect(Math.abs(d(bp.sHat, bp.rHat))).toBeLessThan(4e-15);
        expect(Math.abs(d(bp.rHat, bp.rHat) - 1)).toBeLessThan(4e-15);
        expect(Math.abs(d(bp.bVectorKm, bp.sHat))).toBeLessThan(1e-9);
      }
    });
    it('should take the Earth pole as the J2000 z axis', () => {
      expect(referencePole('equator', 'earth')).toEqual([0, 0, 1]);
    });
  });

  describe('when the input is bad', () => {
    it('should name the field', () => {
      expect(() => computeBPlane([1, 2, 3], MU)).toThrow(InvalidInputError);
      expect(() => computeBPlane(APPROACH, -1)).toThrow(/muKm3S2/);
      expect(() => computeBPlane(APPROACH, MU, 'equator')).toThrow(/body/);
    });
  });
});

describe('B-plane of an encounter found by a propagation', () => {
  const { helio } = flybyStart(2.5);
  const run = (initial = helio) => propagate({
    initial, endEpochTdbS: PERIAPSIS_EPOCH + 86400, forces: forcesAbout('sun'), ephemeris: flybyEphemeris,
    relativeTolerance: 1e-12, absoluteTolerance: 1e-12, switching: { enabled: true },
    events: [{ kind: 'closest-approach', body: 'mars' }],
  });
  describe('when the trajectory flies by Mars on a hyperbola', () => {
    it('should give the B-plane at the closest approach, with |B| matching r_p and v∞', () => {
      const r = run();
      const bp = bPlaneOfEncounter(r.events, 'mars', GM_KM3_S2.mars, 'equator');
      const rp = bp.value.periapsisRadiusKm;
      const vi = bp.value.vInfinityKmS;
      // Curtis §8.9 aiming radius. The Sun's tide over the 2.5-day approach moves periapsis from the
      // two-body construction's 3696 km by ~52 km (measured), hence the 100-km bound.
      expect(bp.value.bMagnitudeKm).toBeCloseTo(rp * Math.sqrt(1 + (2 * GM_KM3_S2.mars) / (rp * vi * vi)), 6);
      expect(Math.abs(bp.approach.distanceKm! - PERIAPSIS_RADIUS_KM)).toBeLessThan(100);
      expect(Math.abs(bp.value.timeToPeriapsisS)).toBeLessThan(1e-3);
    });
  });
  describe('when the body is never approached on a hyperbola', () => {
    it('should throw naming the closest approach found', () => {
      const bound = propagate(request0());
      expect(() => bPlaneOfEncounter(bound.events, 'earth', MU)).toThrow(/never approached on a hyperbola: closest approach found at .* distance .* km/);
      expect(() => bPlaneOfEncounter([], 'mars', GM_KM3_S2.mars)).toThrow(/no closest approach to mars/);
    });
  });
});

function request0() {
  return {
    initial: { epochTdbS: 0, centre: 'earth' as const, frame: 'J2000_EQUATORIAL' as const, positionKm: [7000, 0, 0] as Vec3, velocityKmS: [0, 7.9, 0.5] as Vec3 },
    endEpochTdbS: 20000, forces: { centralBody: 'earth' as const, perturbingBodies: [] }, ephemeris: createBuiltinEphemeris(),
    events: [{ kind: 'closest-approach' as const, body: 'earth' as const }],
  };
}

import * as Astronomy from 'astronomy-engine';
import { describe, expect, it } from 'vitest';
import {
  changeCentre, createBuiltinEphemeris, determinant3, eclipticFromEquatorialJ2000, equatorialFromEclipticJ2000,
  inertialToLocal, InvalidInputError, localToInertial, multiplyMatrices3, OBLIQUITY_J2000_RAD,
  ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000, rtnMatrix, stateToFrame, transpose3, vnbMatrix,
} from '../../propagator/index.ts';
import type { Matrix3, StateVector, Vec3 } from '../../propagator/index.ts';

function expectOrthonormalRightHanded(m: Matrix3): void {
  const product = multiplyMatrices3(m, transpose3(m));
  const identity = [1, 0, 0, 0, 1, 0, 0, 0, 1];
  product.forEach((value, i) => expect(Math.abs(value - identity[i])).toBeLessThan(1e-14));
  expect(determinant3(m)).toBeCloseTo(1, 14);
}

function dot(a: ArrayLike<number>, b: ArrayLike<number>): number {
  return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

const r: Vec3 = [7000, -1200, 300];
const v: Vec3 = [1.1, 7.2, 0.9];

describe('J2000 equatorial ↔ ecliptic rotation', () => {
  describe('when compared with astronomy-engine Rotation_EQJ_ECL (an independent library)', () => {
    it('should rotate vectors the same way to 1e-11 relative (obliquities agree to ~1e-6 arcsec)', () => {
      const rot = Astronomy.Rotation_EQJ_ECL();
      for (const vec of [[1, 0, 0], [0, 1, 0], [0, 0, 1], [0.3, -0.7, 0.2]] as Vec3[]) {
        const theirs = Astronomy.RotateVector(rot, new Astronomy.Vector(vec[0], vec[1], vec[2], Astronomy.MakeTime(0)));
        const ours = eclipticFromEquatorialJ2000(vec);
        expect(Math.abs(ours[0] - theirs.x)).toBeLessThan(1e-11);
        expect(Math.abs(ours[1] - theirs.y)).toBeLessThan(1e-11);
        expect(Math.abs(ours[2] - theirs.z)).toBeLessThan(1e-11);
      }
    });
  });
  describe('when checking known directions', () => {
    it('should map the celestial north pole to ecliptic latitude 90° − ε0 and keep the equinox on x', () => {
      const pole = eclipticFromEquatorialJ2000([0, 0, 1]);
      expect(Math.asin(pole[2])).toBeCloseTo(Math.PI / 2 - OBLIQUITY_J2000_RAD, 14);
      expect(eclipticFromEquatorialJ2000([1, 0, 0])).toEqual([1, 0, 0]);
    });
    it('should be an orthonormal right-handed matrix whose inverse undoes it', () => {
      expectOrthonormalRightHanded([...ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000] as Matrix3);
      const back = equatorialFromEclipticJ2000(eclipticFromEquatorialJ2000(r));
      back.forEach((x, i) => expect(Math.abs(x - r[i])).toBeLessThan(1e-11));
    });
  });
  describe('when converting a whole state', () => {
    it('should keep epoch and centre and round-trip position and velocity', () => {
      const s: StateVector = { epochTdbS: 1e8, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: r, velocityKmS: v };
      const ecl = stateToFrame(s, 'J2000_ECLIPTIC');
      expect(ecl.frame).toBe('J2000_ECLIPTIC');
      expect(ecl.centre).toBe('earth');
      const back = stateToFrame(ecl, 'J2000_EQUATORIAL');
      back.positionKm.forEach((x, i) => expect(Math.abs(x - r[i])).toBeLessThan(1e-11));
      back.velocityKmS.forEach((x, i) => expect(Math.abs(x - v[i])).toBeLessThan(1e-15));
    });
  });
});

describe('changeCentre', () => {
  const ephemeris = createBuiltinEphemeris();
  describe('when moving a geocentric state to the Sun and back', () => {
    it('should add the Earth heliocentric state and return to the start', () => {
      const s: StateVector = { epochTdbS: 8e8, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: r, velocityKmS: v };
      const helio = changeCentre(s, 'sun', ephemeris);
      const earth = new Float64Array(6);
      ephemeris.stateInto('earth', 'sun', 8e8, earth);
      expect(helio.positionKm[0]).toBeCloseTo(r[0] + earth[0], 6);
      expect(helio.velocityKmS[2]).toBeCloseTo(v[2] + earth[5], 12);
      const back = changeCentre(helio, 'earth', ephemeris);
      back.positionKm.forEach((x, i) => expect(Math.abs(x - r[i])).toBeLessThan(1e-6));
    });
    it('should rotate the offset into an ecliptic state frame (same as converting after the move)', () => {
      const s: StateVector = { epochTdbS: 8e8, centre: 'earth', frame: 'J2000_EQUATORIAL', positionKm: r, velocityKmS: v };
      const viaEcl = changeCentre(stateToFrame(s, 'J2000_ECLIPTIC'), 'moon', ephemeris);
      const direct = stateToFrame(changeCentre(s, 'moon', ephemeris), 'J2000_ECLIPTIC');
      viaEcl.positionKm.forEach((x, i) => expect(Math.abs(x - direct.positionKm[i])).toBeLessThan(1e-8));
      expect(viaEcl.centre).toBe('moon');
    });
  });
});

describe('local orbital frames', () => {
  describe('when building RTN', () => {
    it('should be orthonormal and right-handed with R along r and N along r × v', () => {
      const m = rtnMatrix(r, v);
      expectOrthonormalRightHanded(m);
      const rn = Math.hypot(...r);
      expect(dot(m.slice(0, 3), r)).toBeCloseTo(rn, 10);
      expect(dot(m.slice(6, 9), r)).toBeCloseTo(0, 10);
      expect(dot(m.slice(6, 9), v)).toBeCloseTo(0, 12);
      expect(dot(m.slice(3, 6), v)).toBeGreaterThan(0); // T points along-track for a prograde motion
    });
    it('should give the textbook axes for a circular equatorial orbit (common practice)', () => {
      const m = rtnMatrix([7000, 0, 0], [0, 7.5, 0]);
      expect(m).toEqual([1, 0, 0, 0, 1, 0, 0, 0, 1]);
    });
  });
  describe('when building VNB', () => {
    it('should be orthonormal and right-handed with V along v', () => {
      const m = vnbMatrix(r, v);
      expectOrthonormalRightHanded(m);
      expect(dot(m.slice(0, 3), v)).toBeCloseTo(Math.hypot(...v), 12);
      expect(dot(m.slice(3, 6), rtnMatrix(r, v).slice(6, 9))).toBeCloseTo(1, 14);
    });
    it('should point B away from the centre for a circular equatorial orbit (B = V × N = +x)', () => {
      expect(vnbMatrix([7000, 0, 0], [0, 7.5, 0])).toEqual([0, 1, 0, 0, 0, 1, 1, 0, 0]);
    });
  });
  describe('when converting vectors', () => {
    it('should round-trip local ↔ inertial and turn a V burn into a burn along v', () => {
      const dv: Vec3 = [0.01, -0.002, 0.003];
      for (const frame of ['RTN', 'VNB'] as const) {
        const back = inertialToLocal(localToInertial(dv, frame, r, v), frame, r, v);
        back.forEach((x, i) => expect(Math.abs(x - dv[i])).toBeLessThan(1e-17));
      }
      const along = localToInertial([1, 0, 0], 'VNB', r, v);
      along.forEach((x, i) => expect(x).toBeCloseTo(v[i] / Math.hypot(...v), 14));
    });
    it('should reject a zero position or a velocity parallel to the position, naming the field', () => {
      expect(() => rtnMatrix([0, 0, 0], v)).toThrow(InvalidInputError);
      expect(() => vnbMatrix(r, [2 * r[0], 2 * r[1], 2 * r[2]])).toThrow(/velocityKmS/);
    });
  });
});

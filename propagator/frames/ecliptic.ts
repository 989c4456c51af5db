/**
 * J2000 mean equator and equinox (ICRF-aligned, "EQJ") ↔ J2000 mean ecliptic and equinox ("ECLJ"):
 * a rotation about the common x axis (the J2000 mean equinox) by the mean obliquity of J2000.
 */
import type { Vec3 } from '../types.ts';
import type { Matrix3 } from '../math/matrix3.ts';
import { multiplyMatrixVector, multiplyTransposeVector } from '../math/matrix3.ts';

/** Mean obliquity of the ecliptic at J2000.0, arcseconds: ε0 = 84381.406″ of the IAU 2006 precession
 * (Capitaine, Wallace & Chapront 2003, "P03"; adopted by IAU 2006 Resolution B1; from memory). The older
 * IAU 1976 value 84381.448″ differs by 0.042″ (2e-7 rad, ~30 km at 1 au). */
export const OBLIQUITY_J2000_ARCSEC = 84381.406;
/** The same obliquity in radians. */
export const OBLIQUITY_J2000_RAD = (OBLIQUITY_J2000_ARCSEC / 3600) * (Math.PI / 180);

const C = Math.cos(OBLIQUITY_J2000_RAD);
const S = Math.sin(OBLIQUITY_J2000_RAD);

/** Rotation taking J2000 equatorial components to J2000 ecliptic components (row-major):
 * v_ecl = R · v_eq with R = R_x(ε0). */
export const ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000: Readonly<Matrix3> = Object.freeze([
  1, 0, 0,
  0, C, S,
  0, -S, C,
]) as Readonly<Matrix3>;

/** J2000 equatorial → J2000 ecliptic components of any vector (units unchanged). */
export function eclipticFromEquatorialJ2000(v: ArrayLike<number>): Vec3 {
  return multiplyMatrixVector(ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000, v);
}

/** J2000 ecliptic → J2000 equatorial components of any vector (units unchanged). */
export function equatorialFromEclipticJ2000(v: ArrayLike<number>): Vec3 {
  return multiplyTransposeVector(ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000, v);
}

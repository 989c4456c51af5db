/** Frames: J2000 equatorial ↔ ecliptic, centre changes through an ephemeris, local RTN and VNB. */
export type { Matrix3 } from '../math/matrix3.ts';
export { multiplyMatrixVector, multiplyTransposeVector, transpose3, multiplyMatrices3, determinant3 } from '../math/matrix3.ts';
export {
  OBLIQUITY_J2000_ARCSEC, OBLIQUITY_J2000_RAD, ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000,
  eclipticFromEquatorialJ2000, equatorialFromEclipticJ2000,
} from './ecliptic.ts';
export { rotateVectorBetweenFrames, stateToFrame, changeCentre } from './state-frames.ts';
export { rtnMatrix, vnbMatrix, localFrameMatrix, localToInertial, inertialToLocal } from './local-frames.ts';

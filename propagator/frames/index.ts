/** The one frames module: J2000 equatorial ↔ ecliptic, centre changes through an ephemeris, local RTN, VNB
 * and TNW axes, 6×6 state rotations. */
export {
  OBLIQUITY_J2000_ARCSEC, OBLIQUITY_J2000_RAD, ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000,
  eclipticFromEquatorialJ2000, equatorialFromEclipticJ2000,
} from './ecliptic.ts';
export { rotateVectorBetweenFrames, frameRotation, stateToFrame, changeCentre, covarianceBetweenFrames } from './state-frames.ts';
export {
  rtnMatrix, vnbMatrix, tnwMatrix, localFrameMatrix, localToInertial, inertialToLocal, localAxes, axesToInertial,
  axesFromInertial, axesToInertialMatrix, stateRotation6, vnbFromTnw, tnwFromVnb, type AxesName, type Rotation3,
} from './local-frames.ts';

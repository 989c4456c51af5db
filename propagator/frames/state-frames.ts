/**
 * Whole-state conversions: between the inertial frames, and between centres through an ephemeris.
 */
import { InvalidInputError } from '../../contract/errors.ts';
import type { Ephemeris } from '../ephemeris/ephemeris.ts';
import type { BodyName, InertialFrame, StateVector, Vec3 } from '../types.ts';
import { INERTIAL_FRAMES } from '../types.ts';
import { transpose3, type Matrix3 } from '../math/matrix3.ts';
import { congruence } from '../math/matrix.ts';
import { stateRotation6 } from './local-frames.ts';
import { ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000, eclipticFromEquatorialJ2000, equatorialFromEclipticJ2000 } from './ecliptic.ts';

function checkFrame(frame: InertialFrame, field: string): void {
  if (!INERTIAL_FRAMES.includes(frame)) {
    throw new InvalidInputError(field, `unknown frame '${String(frame)}' (use ${INERTIAL_FRAMES.join(' or ')})`);
  }
}

/** The rotation (row-major 3×3) taking components in frame `from` to components in frame `to`. */
export function frameRotation(from: InertialFrame, to: InertialFrame): Matrix3 {
  checkFrame(from, 'from');
  checkFrame(to, 'to');
  if (from === to) return [1, 0, 0, 0, 1, 0, 0, 0, 1];
  const r = [...ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000] as Matrix3;
  return to === 'J2000_ECLIPTIC' ? r : transpose3(r);
}

/** A 6×6 [r, v] covariance (km², km²/s, km²/s²) given in the axes of inertial frame `from`, in the axes of
 * `to`: R·C·Rᵀ with R = diag(Q, Q) (a fresh copy when the frames are the same). */
export function covarianceBetweenFrames(c: readonly (readonly number[])[], from: InertialFrame, to: InertialFrame): number[][] {
  if (from === to) return c.map((row) => [...row]);
  return congruence(stateRotation6(frameRotation(from, to)), c);
}

/** Rotates a vector's components from frame `from` to frame `to` (both J2000 inertial; no translation). */
export function rotateVectorBetweenFrames(v: ArrayLike<number>, from: InertialFrame, to: InertialFrame): Vec3 {
  checkFrame(from, 'from');
  checkFrame(to, 'to');
  if (from === to) return [v[0], v[1], v[2]];
  return to === 'J2000_ECLIPTIC' ? eclipticFromEquatorialJ2000(v) : equatorialFromEclipticJ2000(v);
}

/** The same state (same epoch, same centre) with its components in `frame`. km, km/s; TDB epoch kept. */
export function stateToFrame(state: StateVector, frame: InertialFrame): StateVector {
  checkFrame(frame, 'frame');
  return {
    epochTdbS: state.epochTdbS,
    centre: state.centre,
    frame,
    positionKm: rotateVectorBetweenFrames(state.positionKm, state.frame, frame),
    velocityKmS: rotateVectorBetweenFrames(state.velocityKmS, state.frame, frame),
  };
}

/**
 * The same state relative to `newCentre`: adds the old centre's state relative to the new one, taken from
 * `ephemeris` at the state's epoch (J2000 equatorial, rotated into the state's frame if needed). Kinematic
 * translation only (no light time). Throws OutOfSpanError outside the ephemeris span.
 */
export function changeCentre(state: StateVector, newCentre: BodyName, ephemeris: Ephemeris): StateVector {
  checkFrame(state.frame, 'state.frame');
  if (state.centre === newCentre) return { ...state, positionKm: [...state.positionKm], velocityKmS: [...state.velocityKmS] };
  const offset = new Float64Array(6);
  ephemeris.stateInto(state.centre, newCentre, state.epochTdbS, offset, 0);
  const dp = rotateVectorBetweenFrames(offset.subarray(0, 3), 'J2000_EQUATORIAL', state.frame);
  const dv = rotateVectorBetweenFrames(offset.subarray(3, 6), 'J2000_EQUATORIAL', state.frame);
  return {
    epochTdbS: state.epochTdbS,
    centre: newCentre,
    frame: state.frame,
    positionKm: [state.positionKm[0] + dp[0], state.positionKm[1] + dp[1], state.positionKm[2] + dp[2]],
    velocityKmS: [state.velocityKmS[0] + dv[0], state.velocityKmS[1] + dv[1], state.velocityKmS[2] + dv[2]],
  };
}

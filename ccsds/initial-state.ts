/**
 * An OPM as the planner's initial state: epoch (with its time scale named), centre, frame, position,
 * velocity and, when the OPM has one, the covariance rotated into the state's frame.
 */
import type { PlanningProblem } from '../planner/index.ts';
import {
  type InertialFrame, type Vec3, ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000,
} from '../propagator/index.ts';
import {
  covarianceInertialToLocal, covarianceLocalToInertial, rtnAxes, tnwAxes,
} from './covariance.ts';
import { frameMeaningFromName } from './frames.ts';
import type { Opm } from './odm-types.ts';
import { readOpm } from './opm-reader.ts';
import { normaliseEpochText } from './values.ts';

export type PlannerInitialState = PlanningProblem['initialState'];

export interface OpmInitialState {
  /** Ready for the problem's `initialState`. */
  initialState: PlannerInitialState;
  /** MASS from the spacecraft parameters, kg, when given. */
  massKg?: number;
  /** What was read but not used (maneuvers, Keplerian elements...), for the caller to show. */
  notes: string[];
  opm: Opm;
}

function rows(m: readonly number[]): [Vec3, Vec3, Vec3] {
  return [[m[0], m[1], m[2]], [m[3], m[4], m[5]], [m[6], m[7], m[8]]];
}

/** The OPM covariance expressed in the axes of the OPM's REF_FRAME (km², km²/s, km²/s²). */
export function covarianceInStateFrame(opm: Opm): number[][] | undefined {
  const c = opm.covariance;
  if (!c) return undefined;
  const { positionKm, velocityKmS } = opm.state;
  const meaning = frameMeaningFromName('COV_REF_FRAME', 0, c.covRefFrame ?? opm.metadata.refFrame, opm.metadata.centre);
  if (meaning.kind === 'local') {
    const axes = meaning.ccsdsName === 'TNW' ? tnwAxes(positionKm, velocityKmS) : rtnAxes(positionKm, velocityKmS);
    return covarianceLocalToInertial(c.matrix, axes);
  }
  return rotateInertialCovariance(c.matrix, meaning.frame, opm.metadata.frame);
}

/** Rotates a 6×6 covariance between the J2000 equatorial and ecliptic axes. */
export function rotateInertialCovariance(matrix: number[][], from: InertialFrame, to: InertialFrame): number[][] {
  if (from === to) return matrix.map((row) => [...row]);
  const eqToEcl = rows(ROTATION_EQUATORIAL_TO_ECLIPTIC_J2000);
  return from === 'J2000_EQUATORIAL' ? covarianceInertialToLocal(matrix, eqToEcl) : covarianceLocalToInertial(matrix, eqToEcl);
}

/**
 * Reads OPM text (KVN or XML) and maps it onto the planner's initial state. Throws CcsdsFormatError
 * (an InvalidInputError naming the keyword, with the line) for anything malformed or unsupported.
 */
export function readOpmAsInitialState(text: string): OpmInitialState {
  const opm = readOpm(text);
  const { metadata, state } = opm;
  const iso = normaliseEpochText('EPOCH', 0, state.epoch, metadata.timeSystem);
  const covariance = covarianceInStateFrame(opm);
  const initialState: PlannerInitialState = {
    epoch: `${iso} ${metadata.timeSystem}`,
    centre: metadata.centre,
    frame: metadata.frame,
    positionKm: [...state.positionKm],
    velocityKmS: [...state.velocityKmS],
    ...(covariance ? { covarianceKmKmS: covariance } : {}),
  };
  const notes: string[] = [];
  if (opm.maneuvers.length > 0) {
    notes.push(`${opm.maneuvers.length} maneuver block(s) in the OPM are not used as the initial state; `
      + 'state the burns in the problem');
  }
  if (opm.keplerian) notes.push('Keplerian elements in the OPM are informative; the Cartesian state is used');
  if (opm.userDefined.length > 0) notes.push(`user-defined parameters ignored: ${opm.userDefined.map(([k]) => k).join(', ')}`);
  return {
    initialState, notes, opm,
    ...(opm.spacecraft?.massKg !== undefined ? { massKg: opm.spacecraft.massKg } : {}),
  };
}

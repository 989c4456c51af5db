/**
 * An OPM as the planner's initial state: epoch (with its time scale named), centre, frame, position,
 * velocity and, when the OPM has one, the covariance rotated into the state's frame.
 */
import type { PlanningProblem } from '../../contract/problem-schema.ts';
import {
  congruence, covarianceBetweenFrames, localFrameMatrix, stateRotation6, transpose,
} from '../../propagator/index.ts';
import { frameMeaningFromName } from './frames.ts';
import type { Opm } from './odm-types.ts';
import { readOpm } from './opm-reader.ts';
import { normaliseEpochText } from '../syntax/values.ts';

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

/** The OPM covariance expressed in the axes of the OPM's REF_FRAME (km², km²/s, km²/s²). */
export function covarianceInStateFrame(opm: Opm): number[][] | undefined {
  const c = opm.covariance;
  if (!c) return undefined;
  const { positionKm, velocityKmS } = opm.state;
  const meaning = frameMeaningFromName('COV_REF_FRAME', 0, c.covRefFrame ?? opm.metadata.refFrame, opm.metadata.centre);
  if (meaning.kind === 'local') {
    // C_inertial = Bᵀ C_local B with B = diag(A, A), A the local rotation (rows = local axes). The frame is
    // taken as non-rotating at the epoch (the usual reading of a local-frame covariance; no ω × r term).
    const local = localFrameMatrix(meaning.ccsdsName === 'TNW' ? 'TNW' : 'RTN', positionKm, velocityKmS);
    return congruence(transpose(stateRotation6(local)), c.matrix);
  }
  return covarianceBetweenFrames(c.matrix, meaning.frame, opm.metadata.frame);
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

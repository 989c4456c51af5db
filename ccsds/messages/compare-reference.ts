/**
 * Compares states (for example a plan's predicted trajectory) with a reference trajectory read from an
 * OEM: position and velocity differences at each state's epoch, in J2000 equatorial axes.
 */
import {
  type Ephemeris, InvalidInputError, type StateVector, changeCentre, stateToFrame,
} from '../../propagator/index.ts';
import type { OemTrajectory } from './oem-ephemeris.ts';

export interface ReferenceComparison {
  /** States compared (those inside the reference's span). */
  compared: number;
  /** States outside the reference's span, skipped. */
  outsideSpan: number;
  /** Largest |Δr|, km, and its epoch (TDB s from J2000); null when nothing was compared. */
  maxPositionDifferenceKm: number | null;
  maxPositionEpochTdbS: number | null;
  /** Largest |Δv|, km/s. */
  maxVelocityDifferenceKmS: number | null;
}

/**
 * Differences between `states` and `reference` (km, km/s). States about another centre are moved to the
 * reference's centre through `ephemeris` (required then); any inertial frame is accepted.
 */
export function compareWithReference(states: readonly StateVector[], reference: OemTrajectory, ephemeris?: Ephemeris): ReferenceComparison {
  let compared = 0;
  let outsideSpan = 0;
  let maxR = -1;
  let maxREpoch: number | null = null;
  let maxV = -1;
  for (const s of states) {
    if (s.epochTdbS < reference.span.startTdbS || s.epochTdbS > reference.span.endTdbS) { outsideSpan++; continue; }
    let moved = s;
    if (s.centre !== reference.centre) {
      if (!ephemeris) throw new InvalidInputError('ephemeris', `states about ${s.centre} need an ephemeris to compare with a reference about ${reference.centre}`);
      moved = changeCentre(s, reference.centre, ephemeris);
    }
    const eq = stateToFrame(moved, 'J2000_EQUATORIAL');
    const ref = reference.stateAt(s.epochTdbS);
    const dr = Math.hypot(...eq.positionKm.map((x, i) => x - ref.positionKm[i]));
    const dv = Math.hypot(...eq.velocityKmS.map((x, i) => x - ref.velocityKmS[i]));
    compared++;
    if (dr > maxR) { maxR = dr; maxREpoch = s.epochTdbS; }
    maxV = Math.max(maxV, dv);
  }
  return {
    compared, outsideSpan,
    maxPositionDifferenceKm: compared ? maxR : null,
    maxPositionEpochTdbS: maxREpoch,
    maxVelocityDifferenceKmS: compared ? maxV : null,
  };
}

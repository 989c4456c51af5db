/**
 * Data read from (or to be written as) an Orbit Parameter Message and an Orbit Ephemeris Message,
 * CCSDS 502.0-B. Names as written in the file are kept beside their meaning so a message is rewritten as
 * it was read. Units km, s, km/s, kg, deg; epochs as written (text) and as TDB seconds from J2000.
 */
import type { BodyName, TimeScale, Vec3 } from '../../propagator/index.ts';
import type { MessageFrame } from './frames.ts';

export interface OdmHeader {
  /** CCSDS_OPM_VERS / CCSDS_OEM_VERS, e.g. `2.0`. */
  version: string;
  /** UTC date-time text of file creation, as written. */
  creationDate: string;
  originator: string;
  comments: string[];
  /** Version 3.0 only: free-text classification / caveats. */
  classification?: string;
  /** Version 3.0 only: the originator's message identifier. */
  messageId?: string;
}

export interface OdmMetadata {
  comments: string[];
  objectName: string;
  objectId: string;
  /** CENTER_NAME as written, and the body it denotes. */
  centerName: string;
  centre: BodyName;
  /** REF_FRAME as written (EME2000, ICRF or GCRF), and the inertial frame it denotes: always J2000
   * equatorial (the standard's table has no ecliptic frame; ecliptic states are rotated before writing). */
  refFrame: string;
  frame: MessageFrame;
  refFrameEpoch?: string;
  timeSystem: TimeScale;
}

/** A 6×6 covariance of [r, v] in `refFrame` (an inertial frame name or RTN / RSW / TNW). */
export interface OdmCovariance {
  comments: string[];
  /** COV_REF_FRAME as written, or undefined when it was left out (then it is REF_FRAME). */
  covRefFrame?: string;
  /** Symmetric 6×6: km², km²/s, km²/s². */
  matrix: number[][];
}

export interface OpmStateVector {
  comments: string[];
  /** EPOCH as written (in the metadata's time system). */
  epoch: string;
  epochTdbS: number;
  positionKm: Vec3;
  velocityKmS: Vec3;
}

export interface OpmKeplerianElements {
  comments: string[];
  semiMajorAxisKm: number;
  eccentricity: number;
  inclinationDeg: number;
  raOfAscNodeDeg: number;
  argOfPericenterDeg: number;
  anomaly: { kind: 'true' | 'mean'; deg: number };
  gmKm3S2: number;
}

export interface OpmSpacecraftParameters {
  comments: string[];
  massKg?: number;
  solarRadAreaM2?: number;
  solarRadCoeff?: number;
  dragAreaM2?: number;
  dragCoeff?: number;
}

export interface OpmManeuver {
  comments: string[];
  /** MAN_EPOCH_IGNITION as written, and in TDB seconds from J2000. */
  epochIgnition: string;
  epochIgnitionTdbS: number;
  /** 0 for an impulsive maneuver. */
  durationS: number;
  /** Mass change, kg, ≤ 0. */
  deltaMassKg: number;
  /** MAN_REF_FRAME as written (RTN, RSW, TNW or an inertial frame name). */
  manRefFrame: string;
  deltaVKmS: Vec3;
}

export interface Opm {
  header: OdmHeader;
  metadata: OdmMetadata;
  state: OpmStateVector;
  keplerian?: OpmKeplerianElements;
  spacecraft?: OpmSpacecraftParameters;
  covariance?: OdmCovariance;
  maneuvers: OpmManeuver[];
  /** USER_DEFINED_x keywords, `x` → value, in file order. */
  userDefined: [string, string][];
}

export type InterpolationMethod = 'HERMITE' | 'LAGRANGE' | 'LINEAR';

export interface OemMetadata extends OdmMetadata {
  startTime: string;
  startTdbS: number;
  useableStartTime?: string;
  useableStartTdbS?: number;
  useableStopTime?: string;
  useableStopTdbS?: number;
  stopTime: string;
  stopTdbS: number;
  interpolation?: InterpolationMethod;
  interpolationDegree?: number;
}

/** One ephemeris line: epoch, position km, velocity km/s, optional acceleration km/s². */
export interface OemState {
  epoch: string;
  epochTdbS: number;
  positionKm: Vec3;
  velocityKmS: Vec3;
  accelerationKmS2?: Vec3;
  /** Line the state was read from (0 for states built in memory). */
  line: number;
}

export interface OemCovariance extends OdmCovariance {
  epoch: string;
  epochTdbS: number;
}

export interface OemSegment {
  metadata: OemMetadata;
  /** Comments at the start of the data block. */
  dataComments: string[];
  states: OemState[];
  covariances: OemCovariance[];
}

export interface Oem {
  header: OdmHeader;
  segments: OemSegment[];
}

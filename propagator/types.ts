/**
 * Shared value types of the propagator's public face.
 *
 * Conventions (see DEVELOPERS.md): distances km, times s, velocities km/s, masses kg.
 * Epochs are TDB seconds from J2000.0 (2000-01-01T12:00:00 TDB) held in one float64: near 2030 its
 * resolution is about 1.2e-7 s (one ulp of 1e9 s), far finer than any event tolerance used here.
 */

import type { BodyName, InertialFrame, Vec3 } from '../contract/bodies.ts';

export { BODY_NAMES, INERTIAL_FRAMES } from '../contract/bodies.ts';
export type { BodyName, InertialFrame, Vec3 } from '../contract/bodies.ts';

/** Local orbital frames for burns and reports: RTN (radial, transverse, normal) and VNB (velocity,
 * normal, binormal). */
export type LocalFrame = 'RTN' | 'VNB';

/** A Cartesian state: position (km) and velocity (km/s) of the spacecraft relative to `centre`,
 * axes of `frame`, at `epochTdbS` (TDB seconds from J2000). */
export interface StateVector {
  epochTdbS: number;
  centre: BodyName;
  frame: InertialFrame;
  positionKm: Vec3;
  velocityKmS: Vec3;
}

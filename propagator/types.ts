/**
 * Shared value types of the propagator's public face.
 *
 * Conventions (see DEVELOPERS.md): distances km, times s, velocities km/s, masses kg.
 * Epochs are TDB seconds from J2000.0 (2000-01-01T12:00:00 TDB) held in one float64: near 2030 its
 * resolution is about 1.2e-7 s (one ulp of 1e9 s), far finer than any event tolerance used here.
 */

/** A 3-vector; the unit is carried by the name of the field holding it. */
export type Vec3 = [number, number, number];

/** Bodies known to the ephemerides and force models. Planet names denote the planet's system barycentre
 * for the outer planets (Jupiter..Neptune) and the body itself for Mercury, Venus, Earth, Moon, Mars. */
export const BODY_NAMES = [
  'sun', 'mercury', 'venus', 'earth', 'moon', 'mars', 'jupiter', 'saturn', 'uranus', 'neptune',
] as const;
export type BodyName = (typeof BODY_NAMES)[number];

/** Inertial frames. J2000_EQUATORIAL is the ICRF-aligned mean equator and equinox of J2000 used for
 * integration; J2000_ECLIPTIC is the mean ecliptic and equinox of J2000. */
export const INERTIAL_FRAMES = ['J2000_EQUATORIAL', 'J2000_ECLIPTIC'] as const;
export type InertialFrame = (typeof INERTIAL_FRAMES)[number];

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

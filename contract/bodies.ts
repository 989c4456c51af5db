/**
 * Names shared by every room and the browser: the bodies the ephemerides and force models know, the
 * inertial frames, and the 3-vector type. Plain data; the propagator re-exports them from its types.
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

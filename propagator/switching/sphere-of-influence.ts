/**
 * Sphere-of-influence radii by Laplace's formula r_SOI = a (m/M)^(2/5), with a the body's mean distance
 * from its primary and m/M the mass ratio (taken as the GM ratio of constants.ts).
 */
import { GM_KM3_S2, KM_PER_AU } from '../constants.ts';
import { InvalidInputError } from '../../contract/errors.ts';
import type { BodyName } from '../types.ts';

/** The body each body orbits, for switching: planets orbit the Sun, the Moon orbits the Earth. */
export const PRIMARY_OF: Readonly<Partial<Record<BodyName, BodyName>>> = Object.freeze({
  mercury: 'sun', venus: 'sun', earth: 'sun', mars: 'sun', jupiter: 'sun', saturn: 'sun', uranus: 'sun',
  neptune: 'sun', moon: 'earth',
});

/**
 * Mean semi-major axes at J2000, km. Planets: Standish, "Keplerian Elements for Approximate Positions of
 * the Major Planets" (JPL SSD), Table 1 (1800–2050), a in au × KM_PER_AU (Earth row is the Earth–Moon
 * barycentre); Moon: mean Earth–Moon distance 384 400 km (Curtis, Orbital Mechanics for Engineering
 * Students, Table A.1). All from memory.
 */
export const MEAN_SEMI_MAJOR_AXIS_KM: Readonly<Partial<Record<BodyName, number>>> = Object.freeze({
  mercury: 0.38709927 * KM_PER_AU,
  venus: 0.72333566 * KM_PER_AU,
  earth: 1.00000261 * KM_PER_AU,
  mars: 1.52371034 * KM_PER_AU,
  jupiter: 5.202887 * KM_PER_AU,
  saturn: 9.53667594 * KM_PER_AU,
  uranus: 19.18916464 * KM_PER_AU,
  neptune: 30.06992276 * KM_PER_AU,
  moon: 384400,
});

/**
 * Laplace sphere-of-influence radius of a body about its primary, km.
 * @throws InvalidInputError for the Sun (it has no primary here)
 */
export function laplaceSoiRadiusKm(body: BodyName): number {
  const primary = PRIMARY_OF[body];
  const a = MEAN_SEMI_MAJOR_AXIS_KM[body];
  if (primary === undefined || a === undefined) {
    throw new InvalidInputError('body', `'${body}' has no primary, so no sphere of influence`);
  }
  return a * (GM_KM3_S2[body] / GM_KM3_S2[primary]) ** 0.4;
}

/**
 * Sphere-of-influence radius used for switching, km: the caller's override when given (> 0, finite),
 * else the Laplace radius.
 */
export function soiRadiusKm(body: BodyName, overridesKm?: Partial<Record<BodyName, number>>): number {
  const override = overridesKm?.[body];
  if (override !== undefined) {
    if (!(override > 0) || !Number.isFinite(override)) {
      throw new InvalidInputError(`switching.radiusKm.${body}`, `must be a finite number > 0, got ${override}`);
    }
    return override;
  }
  return laplaceSoiRadiusKm(body);
}

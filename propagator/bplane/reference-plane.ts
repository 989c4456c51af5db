/**
 * Reference planes for the B-plane axes: the pole k̂ that fixes T̂ = (Ŝ × k̂)/|Ŝ × k̂|.
 * All vectors J2000 equatorial (ICRF-aligned).
 */
import { InvalidInputError } from '../../contract/errors.ts';
import { OBLIQUITY_J2000_RAD } from '../frames/index.ts';
import type { BodyName, Vec3 } from '../types.ts';

/** 'ecliptic': the J2000 mean ecliptic; 'equator': the mean equator of the approached body at J2000.0. */
export type BPlaneReference = 'ecliptic' | 'equator';

/** Ecliptic north pole in J2000 equatorial axes: (0, −sin ε, cos ε), ε the J2000 obliquity of frames/. */
export const ECLIPTIC_POLE_J2000: Readonly<Vec3> = Object.freeze([
  0, -Math.sin(OBLIQUITY_J2000_RAD), Math.cos(OBLIQUITY_J2000_RAD),
]) as Readonly<Vec3>;

/**
 * North pole right ascension and declination at J2000.0, degrees, ICRF. Constant terms only (the secular
 * rates, ≤ 0.11°/century, and periodic terms are ignored — this fixes a reference direction, not an
 * attitude). Source: Archinal et al. (2011), "Report of the IAU Working Group on Cartographic Coordinates
 * and Rotational Elements: 2009", Celestial Mechanics and Dynamical Astronomy 109:101, Tables 1-2
 * (from memory). Earth: the J2000 mean equator pole, i.e. the z axis (by definition of the frame).
 */
export const POLE_RA_DEC_DEG: Readonly<Record<BodyName, readonly [number, number]>> = Object.freeze({
  sun: [286.13, 63.87],
  mercury: [281.0097, 61.4143],
  venus: [272.76, 67.16],
  earth: [0, 90],
  moon: [269.9949, 66.5392],
  mars: [317.68143, 52.8865],
  jupiter: [268.056595, 64.495303],
  saturn: [40.589, 83.537],
  uranus: [257.311, -15.175],
  neptune: [299.36, 43.46],
});

/** Unit pole vector (J2000 equatorial) of a reference plane for a body's B-plane. */
export function referencePole(reference: BPlaneReference, body?: BodyName): Vec3 {
  if (reference === 'ecliptic') return [...ECLIPTIC_POLE_J2000] as Vec3;
  if (reference !== 'equator') {
    throw new InvalidInputError('referencePlane', `must be 'ecliptic' or 'equator', got '${String(reference)}'`);
  }
  if (body === undefined || !(body in POLE_RA_DEC_DEG)) {
    throw new InvalidInputError('body', `an equator reference plane needs a known body, got '${String(body)}'`);
  }
  if (body === 'earth') return [0, 0, 1];
  const [ra, dec] = POLE_RA_DEC_DEG[body].map((d) => (d * Math.PI) / 180);
  return [Math.cos(dec) * Math.cos(ra), Math.cos(dec) * Math.sin(ra), Math.sin(dec)];
}

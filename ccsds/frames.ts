/**
 * Names the Orbit Data Messages use for centres and frames, mapped onto the propagator's bodies and
 * frames only where the meaning is the same; anything else is refused with the line.
 *
 * Inertial frames (502.0-B 3.2.3.3): EME2000 and ICRF both map to J2000_EQUATORIAL, which this project
 * defines as ICRF-aligned. The EME2000–ICRF frame bias (tens of milliarcseconds, IERS Conventions 2010
 * ch. 5, from memory) is ignored: it is below the accuracy of the built-in ephemerides. GCRF (the ICRF
 * axes at the Earth) is accepted with CENTER_NAME = EARTH only. The standard's frame table has no
 * ecliptic frame; the name ECLIPJ2000 (the mean ecliptic and equinox of J2000, the name in wide use
 * in navigation software) is accepted for J2000_ECLIPTIC, as the standard allows other values agreed in an
 * interface control document — say so to the exchange partner.
 *
 * Local frames for maneuvers and covariance (502.0-B 3.2.4.11): RSW and RTN are the same frame as our
 * RTN. TNW (T along velocity, W along angular momentum, N = W × T) is our VNB with the axes permuted:
 * V = T, N = W, B = V × N = −N(TNW). That permutation is exact, so TNW is accepted.
 */
import { type BodyName, type InertialFrame, type LocalFrame, type Vec3 } from '../propagator/index.ts';
import { CcsdsFormatError } from './errors.ts';

/** CENTER_NAME values (annex B / SANA body names) for the bodies the propagator knows. The outer planets'
 * names in this project denote their system barycentres, so only `<PLANET> BARYCENTER` maps to them. */
const CENTRE_BY_NAME: Readonly<Record<string, BodyName>> = Object.freeze({
  SUN: 'sun',
  MERCURY: 'mercury',
  VENUS: 'venus',
  EARTH: 'earth',
  MOON: 'moon',
  MARS: 'mars',
  'JUPITER BARYCENTER': 'jupiter',
  'SATURN BARYCENTER': 'saturn',
  'URANUS BARYCENTER': 'uranus',
  'NEPTUNE BARYCENTER': 'neptune',
});

/** The CENTER_NAME written for each body. */
export const CENTRE_NAME_OF_BODY: Readonly<Record<BodyName, string>> = Object.freeze(
  Object.fromEntries(Object.entries(CENTRE_BY_NAME).map(([name, body]) => [body, name])) as Record<BodyName, string>,
);

/** REF_FRAME values accepted for inertial axes. */
const INERTIAL_BY_NAME: Readonly<Record<string, InertialFrame>> = Object.freeze({
  EME2000: 'J2000_EQUATORIAL',
  ICRF: 'J2000_EQUATORIAL',
  GCRF: 'J2000_EQUATORIAL',
  ECLIPJ2000: 'J2000_ECLIPTIC',
});

/** The REF_FRAME written for each inertial frame (EME2000 is the name most partners expect). */
export const FRAME_NAME_OF_INERTIAL: Readonly<Record<InertialFrame, string>> = Object.freeze({
  J2000_EQUATORIAL: 'EME2000',
  J2000_ECLIPTIC: 'ECLIPJ2000',
});

/** Maps a CENTER_NAME onto a body; throws CcsdsFormatError with the line for any other name. */
export function centreFromName(line: number, name: string): BodyName {
  const body = CENTRE_BY_NAME[name];
  if (body) return body;
  const hint = /^(JUPITER|SATURN|URANUS|NEPTUNE)$/.test(name)
    ? ` (this project models the ${name.toLowerCase()} system barycentre: write '${name} BARYCENTER')` : '';
  throw new CcsdsFormatError('CENTER_NAME', line, `centre '${name}' is not one the propagator knows${hint}; `
    + `supported: ${Object.keys(CENTRE_BY_NAME).join(', ')}`);
}

/** Maps a REF_FRAME (or the inertial value of MAN_REF_FRAME / COV_REF_FRAME) onto an inertial frame. */
export function inertialFrameFromName(keyword: string, line: number, name: string, centre: BodyName): InertialFrame {
  const frame = INERTIAL_BY_NAME[name];
  if (frame && (name !== 'GCRF' || centre === 'earth')) return frame;
  const why = name === 'GCRF' ? 'GCRF is geocentric: it needs CENTER_NAME = EARTH'
    : `frame '${name}' is not supported`;
  throw new CcsdsFormatError(keyword, line, `${why}; supported inertial frames: `
    + `${Object.keys(INERTIAL_BY_NAME).join(', ')} (GCRF with EARTH only)`);
}

/** What a MAN_REF_FRAME or COV_REF_FRAME names: inertial axes, or a local orbital frame given by the
 * axes it is exactly equivalent to (TNW is VNB with permuted axes). */
export type FrameMeaning =
  | { kind: 'inertial'; frame: InertialFrame }
  | { kind: 'local'; frame: LocalFrame; ccsdsName: 'RTN' | 'RSW' | 'TNW' };

/** Interprets a MAN_REF_FRAME / COV_REF_FRAME value. */
export function frameMeaningFromName(keyword: string, line: number, name: string, centre: BodyName): FrameMeaning {
  if (name === 'RTN' || name === 'RSW') return { kind: 'local', frame: 'RTN', ccsdsName: name };
  if (name === 'TNW') return { kind: 'local', frame: 'VNB', ccsdsName: 'TNW' };
  try {
    return { kind: 'inertial', frame: inertialFrameFromName(keyword, line, name, centre) };
  } catch {
    throw new CcsdsFormatError(keyword, line, `frame '${name}' is not supported; supported: RTN, RSW, TNW, `
      + `${Object.keys(INERTIAL_BY_NAME).join(', ')}`);
  }
}

/** Components in TNW → the same vector's components in VNB (exact axis permutation). */
export function vnbFromTnw([t, n, w]: Vec3): Vec3 {
  return [t, w, n === 0 ? 0 : -n];
}

/** Components in VNB → TNW (inverse of {@link vnbFromTnw}). */
export function tnwFromVnb([v, n, b]: Vec3): Vec3 {
  return [v, b === 0 ? 0 : -b, n];
}
